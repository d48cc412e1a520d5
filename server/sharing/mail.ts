/** The e-mail that carries a share link to a relief teacher. Plain text; the link on its own line. */
import { DateTime } from 'luxon';
import { clockTime } from '../../shared/text/clock.js';
import type { OutgoingMail } from '../mail/outbox.js';

export interface ShareMailFacts {
  to: string;
  sender: string;
  schoolName: string;
  lessonTitle: string;
  className: string;
  /** Wall-clock start in the school's timezone, `2026-08-04T11:10`. */
  startsAt: string;
  room: string;
  url: string;
  expiresAt: Date;
  timezone: string;
}

export function shareLinkMail(f: ShareMailFacts): OutgoingMail {
  const starts = DateTime.fromISO(f.startsAt, { zone: f.timezone }).setLocale('en-AU');
  const until = DateTime.fromJSDate(f.expiresAt, { zone: f.timezone }).setLocale('en-AU');
  const when = `${starts.toFormat('cccc d LLLL')} at ${clockTime(starts.toFormat('HH:mm'))}`;
  return {
    to: f.to,
    subject: `Lesson to cover: ${f.lessonTitle} (${f.className}, ${starts.toFormat('d LLL')})`,
    text: [
      `Hello,`,
      ``,
      `${f.sender} of ${f.schoolName} has shared a lesson for you to take:`,
      `${f.lessonTitle}, ${f.className}, ${when}${f.room ? `, ${f.room}` : ''}.`,
      ``,
      `The lesson, its notes for you, the build instructions and the printable lesson pack are here`,
      `(no account needed):`,
      f.url,
      ``,
      `The link works until ${until.toFormat('cccc d LLLL')}, ${clockTime(until.toFormat('HH:mm'))}. Anyone with it can see this`,
      `lesson, so please do not pass it on. If you did not expect this, ignore this message.`,
    ].join('\n'),
  };
}
