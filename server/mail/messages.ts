/** The words of every e-mail Trayplan sends. Plain text first; links on lines of their own. */
import type { OutgoingMail } from './outbox.js';
import { ROLE_LABELS, type Role } from '../../shared/schemas/common.js';

export function invitationMail(
  appUrl: string,
  to: string,
  schoolName: string,
  role: Role,
  inviter: string,
  token: string,
): OutgoingMail {
  const link = `${appUrl}/invitation/${token}`;
  return {
    to,
    subject: `You're invited to ${schoolName} on Trayplan`,
    text: [
      `Hello,`,
      ``,
      `${inviter} has invited you to join ${schoolName} on Trayplan as ${ROLE_LABELS[role].toLowerCase()}.`,
      `Trayplan plans hands-on build lessons: parts for each group, charging and pack-away.`,
      ``,
      `Choose your name and password here:`,
      link,
      ``,
      `The link works once and runs out in 7 days. If you did not expect this, ignore this message.`,
    ].join('\n'),
  };
}

export function resetMail(appUrl: string, to: string, name: string, token: string): OutgoingMail {
  const link = `${appUrl}/reset/${token}`;
  return {
    to,
    subject: 'Reset your Trayplan password',
    text: [
      `Hello ${name || 'there'},`,
      ``,
      `Someone asked to reset the password of your Trayplan account. To choose a new one, open:`,
      link,
      ``,
      `The link works once and runs out in an hour. Using it signs you out everywhere.`,
      `If you did not ask for this, ignore this message: your password stays as it is.`,
    ].join('\n'),
  };
}

/** Sent once when many wrong passwords were tried for an account (OWASP: notify the owner). */
export function signInWarningMail(appUrl: string, to: string, name: string): OutgoingMail {
  return {
    to,
    subject: 'Someone tried to sign in to your Trayplan account',
    text: [
      `Hello ${name || 'there'},`,
      ``,
      `In the last few minutes, many sign-ins to your Trayplan account failed with a wrong password.`,
      `Your account is not locked: you can still sign in as usual, though it may answer more slowly.`,
      ``,
      `If this was not you, choose a new password now (use "Forgot your password?" on the sign-in`,
      `page) and tell your school admin:`,
      `${appUrl}/sign-in`,
    ].join('\n'),
  };
}

/** To a teacher just added as a co-author of a unit. */
export function coauthorMail(
  appUrl: string,
  to: string,
  name: string,
  unitTitle: string,
  addedBy: string,
  unitId: string,
): OutgoingMail {
  const link = `${appUrl}/units/${unitId}`;
  return {
    to,
    subject: `You are now a co-author of ${unitTitle}`,
    text: [
      `Hello ${name || 'there'},`,
      ``,
      `${addedBy} has added you as a co-author of the unit "${unitTitle}" on Trayplan.`,
      `You can now edit it and its lessons; it is listed under My units. Open it here:`,
      link,
      ``,
      `If you do not know why, ask ${addedBy} or your school's Trayplan admin.`,
    ].join('\n'),
  };
}
