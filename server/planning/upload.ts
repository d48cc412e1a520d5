/**
 * Uploads of the planning routes (an outcomes CSV, activity attachments): one file in the field
 * `file`, held in memory under a size limit, its type decided from its bytes, never its name.
 */
import type { Request, RequestHandler } from 'express';
import multer from 'multer';
import { fileTypeFromBuffer } from 'file-type';
import { HttpError } from '../http.js';

function megabytes(bytes: number): string {
  return `${Math.round((bytes / (1024 * 1024)) * 10) / 10} MB`;
}

/** Middleware: reads one file of at most `maxBytes` from the multipart field `file`. */
export function oneFile(maxBytes: number): RequestHandler {
  const upload = multer({
    storage: multer.memoryStorage(),
    // Browsers send the file name as UTF-8; busboy's default (latin1) would garble "Übung.pdf".
    defParamCharset: 'utf8',
    limits: { fileSize: maxBytes, files: 1, fields: 5, parts: 6 },
  }).single('file');
  return (req, res, next) => {
    upload(req, res, (err: unknown) => {
      if (!err) return next();
      if (err instanceof multer.MulterError) {
        if (err.code === 'LIMIT_FILE_SIZE') {
          return next(
            new HttpError(413, 'too-large', `The file is larger than ${megabytes(maxBytes)}.`),
          );
        }
        return next(
          new HttpError(400, 'invalid-upload', 'Send one file, in the form field named “file”.', [
            { path: 'file', message: 'Send one file, in the form field named “file”.' },
          ]),
        );
      }
      // A multipart body cut short or malformed is the client's mistake, not a server failure.
      return next(new HttpError(400, 'invalid-upload', 'The upload could not be read. Try again.'));
    });
  };
}

/** The uploaded file, or a 400 when none was sent. */
export function uploadedFile(req: Request): Express.Multer.File {
  if (!req.file) {
    throw new HttpError(400, 'invalid-upload', 'Choose a file to upload.', [
      { path: 'file', message: 'Choose a file to upload.' },
    ]);
  }
  return req.file;
}

/** MIME types accepted for attachments and the file name extensions that go with each. */
export const ATTACHMENT_EXTENSIONS: Record<string, readonly string[]> = {
  'application/pdf': ['pdf'],
  'image/png': ['png'],
  'image/jpeg': ['jpg', 'jpeg'],
  'image/webp': ['webp'],
};

/** The type of the bytes when it is one of `allowed`; else 415 naming what is accepted. */
export async function sniffType(
  bytes: Buffer,
  allowed: readonly string[],
  accepted: string,
): Promise<string> {
  const found = await fileTypeFromBuffer(bytes);
  if (!found || !allowed.includes(found.mime)) {
    throw new HttpError(415, 'unsupported-type', `This file is not ${accepted}.`, [
      { path: 'file', message: `Choose ${accepted}.` },
    ]);
  }
  return found.mime;
}

/**
 * A file name safe to store and send back: no folders, no control or direction-changing
 * characters (which can disguise "gpj.exe" as "exe.jpg"), at most 200 characters, and an
 * extension that matches what the bytes are.
 */
export function safeFilename(original: string, mime: string): string {
  const base = original.normalize('NFC').split(/[\\/]/).pop() ?? '';
  let name = base
    .replace(/[\u0000-\u001f\u007f-\u009f\u200e\u200f\u202a-\u202e\u2066-\u2069]/g, '')
    .trim()
    .slice(0, 200);
  if (name === '' || name === '.' || name === '..') name = 'attachment';
  const extensions = ATTACHMENT_EXTENSIONS[mime] ?? [];
  const ext = /\.([^.]+)$/.exec(name)?.[1]?.toLowerCase();
  if (extensions.length && (!ext || !extensions.includes(ext))) name = `${name}.${extensions[0]}`;
  return name;
}

/** RFC 8187 attr-char: what may stay unencoded in `filename*`. */
const ATTR_CHAR = /[A-Za-z0-9!#$&+\-.^_`|~]/;

/**
 * `Content-Disposition: attachment` with the file name (RFC 6266 §4): an ASCII `filename` for old
 * clients and, when the name is not plain ASCII, `filename*` in UTF-8 (RFC 8187 §3.2).
 */
export function attachmentDisposition(filename: string): string {
  const ascii = filename.replace(/[^\x20-\x7e]|["\\]/g, '_');
  if (ascii === filename) return `attachment; filename="${ascii}"`;
  let encoded = '';
  for (const byte of Buffer.from(filename, 'utf8')) {
    const ch = String.fromCharCode(byte);
    encoded +=
      byte < 0x80 && ATTR_CHAR.test(ch)
        ? ch
        : `%${byte.toString(16).toUpperCase().padStart(2, '0')}`;
  }
  return `attachment; filename="${ascii}"; filename*=UTF-8''${encoded}`;
}
