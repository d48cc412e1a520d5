/**
 * File types are decided from the bytes, never from the name or the Content-Type the browser
 * sent: a renamed executable or a PDF posted as a photo is refused (415).
 */
import { fileTypeFromBuffer } from 'file-type';
import { HttpError } from '../http.js';

/** Text types have no magic number: they are decided by the content being valid UTF-8 text. */
export const TEXT_TYPES: readonly string[] = ['text/csv', 'text/plain'];

const WORDS: Record<string, string> = {
  'image/png': 'PNG',
  'image/jpeg': 'JPEG',
  'image/webp': 'WebP',
  'image/gif': 'GIF',
  'application/pdf': 'PDF',
  'text/csv': 'CSV',
  'text/plain': 'plain text',
};

/** "PNG, JPEG or WebP" for a message. */
export function typeWords(types: readonly string[]): string {
  const words = types.map((t) => WORDS[t] ?? t);
  return words.length < 2
    ? (words[0] ?? '')
    : `${words.slice(0, -1).join(', ')} or ${words.at(-1)}`;
}

const utf8 = new TextDecoder('utf-8', { fatal: true });

/**
 * Whether the bytes are UTF-8 text: they decode strictly, and hold no control characters other
 * than tab, line feed, form feed and carriage return (a NUL byte is the usual sign of a binary).
 */
export function isUtf8Text(bytes: Uint8Array): boolean {
  let text: string;
  try {
    text = utf8.decode(bytes);
  } catch {
    return false;
  }
  // eslint-disable-next-line no-control-regex
  return !/[\u0000-\u0008\u000B\u000E-\u001F\u007F]/.test(text);
}

/**
 * Sniffs an upload and returns its MIME type when it is one of `allowed`; otherwise throws a
 * 415 naming what is accepted. Binary types come from `file-type`'s magic numbers; a text type
 * in `allowed` (`text/csv`, `text/plain`) matches bytes that no binary type claims and that are
 * valid UTF-8 text, and the first such type is returned.
 */
export async function sniffUpload(bytes: Uint8Array, allowed: readonly string[]): Promise<string> {
  const found = await fileTypeFromBuffer(bytes);
  if (found && allowed.includes(found.mime)) return found.mime;
  const text = allowed.find((t) => TEXT_TYPES.includes(t));
  if (!found && text && isUtf8Text(bytes)) return text;
  const what = found ? `a ${found.ext.toUpperCase()} file` : 'not a file type Trayplan accepts';
  throw new HttpError(
    415,
    'unsupported-type',
    `This file is ${what}. Upload a ${typeWords(allowed)} file.`,
    [{ path: 'file', message: `Upload a ${typeWords(allowed)} file.` }],
  );
}
