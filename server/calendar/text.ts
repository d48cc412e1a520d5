/**
 * Text values of iCalendar files, as RFC 5545 §3.3.11 defines TEXT: backslash, semicolon and
 * comma are escaped with a backslash and a line break becomes `\n`; control characters other than
 * HTAB are not TEXT at all, so they are dropped.
 */

// eslint-disable-next-line no-control-regex -- matching control characters is the point
const NOT_TEXT = /[\u0000-\u0008\u000b\u000c\u000e-\u001f\u007f]/g;

/** Drops what TEXT may not hold, keeping line breaks (for values the generator escapes). */
export function calendarText(value: string): string {
  return value.replace(NOT_TEXT, '');
}

/** The escaped form of a TEXT value (for properties ical-generator writes as given). */
export function escapeCalendarText(value: string): string {
  return calendarText(value)
    .replace(/[\\;,]/g, (c) => `\\${c}`)
    .replace(/\r\n|\r|\n/g, '\\n');
}
