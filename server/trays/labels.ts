/** What tray labels print for each group: its tray page's address (QR) and its short code. */
import type { AppContext } from '../context.js';
import { formatCode, issueTrayCodes, trayKey } from './tokens.js';

/** Issues (or finds again) the groups' codes; `{APP_URL}/tray/{token}` goes in each QR code. */
export async function trayLabelCodes(
  ctx: AppContext,
  lessonId: string,
  groups: readonly number[],
): Promise<{ groupUrls: string[]; groupCodes: string[] }> {
  const codes = await issueTrayCodes(ctx.db, trayKey(ctx.config.sessionSecret), lessonId, groups);
  const base = ctx.config.appUrl.replace(/\/+$/, '');
  return {
    groupUrls: codes.map((c) => `${base}/tray/${c.token}`),
    groupCodes: codes.map((c) => formatCode(c.code)),
  };
}
