/**
 * The fonts printed into every PDF, embedded from the packages that ship them: Source Sans 3
 * for text and Noto Sans Symbols 2 (its `symbols` subset) for tick boxes and the warning sign,
 * which Source Sans does not have. WOFF files: pdfkit reads WOFF, and crashes on WOFF2.
 */
import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import pdfmake from 'pdfmake';

const require = createRequire(import.meta.url);

/** Family names the document definitions use. */
export const TEXT_FONT = 'Sans';
export const SYMBOL_FONT = 'Symbols';

/** U+2610 BALLOT BOX, printed as an empty tick box. */
export const TICK_BOX = '\u2610';
/** U+26A0 WARNING SIGN. */
export const WARNING_SIGN = '\u26a0';

const FACES = {
  'sans-regular.woff': '@fontsource/source-sans-3/files/source-sans-3-latin-400-normal.woff',
  'sans-bold.woff': '@fontsource/source-sans-3/files/source-sans-3-latin-700-normal.woff',
  'sans-italic.woff': '@fontsource/source-sans-3/files/source-sans-3-latin-400-italic.woff',
  'sans-bold-italic.woff': '@fontsource/source-sans-3/files/source-sans-3-latin-700-italic.woff',
  'symbols.woff':
    '@fontsource/noto-sans-symbols-2/files/noto-sans-symbols-2-symbols-400-normal.woff',
} as const;

let ready = false;

/**
 * Loads the font files into pdfmake's in-memory file system (once per thread) and closes every
 * other door: no URL and no local path is ever read while a document renders.
 */
export function preparePdfmake(): typeof pdfmake {
  if (ready) return pdfmake;
  for (const [name, specifier] of Object.entries(FACES)) {
    pdfmake.virtualfs.writeFileSync(name, readFileSync(require.resolve(specifier)));
  }
  pdfmake.setFonts({
    [TEXT_FONT]: {
      normal: 'sans-regular.woff',
      bold: 'sans-bold.woff',
      italics: 'sans-italic.woff',
      bolditalics: 'sans-bold-italic.woff',
    },
    [SYMBOL_FONT]: {
      normal: 'symbols.woff',
      bold: 'symbols.woff',
      italics: 'symbols.woff',
      bolditalics: 'symbols.woff',
    },
  });
  pdfmake.setUrlAccessPolicy(() => false);
  pdfmake.setLocalAccessPolicy(() => false);
  ready = true;
  return pdfmake;
}
