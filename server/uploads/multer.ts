/**
 * Multipart uploads held in memory (they are stored in PostgreSQL, never on disk), with the
 * size limit enforced while the body streams in: over it is a 413 before the rest is read.
 */
import type { Request, RequestHandler } from 'express';
import multer from 'multer';
import { HttpError } from '../http.js';

export interface UploadOptions {
  /** The multipart field holding the file (`file` unless told). */
  field?: string;
  /** Largest file accepted, in bytes. */
  maxBytes: number;
}

/** "2 MB" for a message. */
export function sizeWords(bytes: number): string {
  return bytes >= 1024 * 1024
    ? `${Math.round(bytes / 1024 / 1024)} MB`
    : `${Math.round(bytes / 1024)} kB`;
}

/**
 * Middleware taking one file from a multipart body into `req.file`. Multer's own errors carry no
 * HTTP status, so they are turned here into the API's errors: too large → 413, anything else
 * about the body (wrong field, extra files, a torn body) → 400. Put it after the role check, so
 * nobody without the right uploads megabytes first.
 */
export function singleFileUpload(options: UploadOptions): RequestHandler {
  const field = options.field ?? 'file';
  const handler = multer({
    storage: multer.memoryStorage(),
    // Browsers send file names as UTF-8; busboy's default (latin1) would garble them.
    defParamCharset: 'utf8',
    limits: { fileSize: options.maxBytes, files: 1, fields: 10, fieldSize: 64 * 1024, parts: 12 },
  }).single(field);
  return (req, res, next) => {
    handler(req, res, (err: unknown) => {
      if (!err) return next();
      if (err instanceof multer.MulterError && err.code === 'LIMIT_FILE_SIZE') {
        return next(
          new HttpError(
            413,
            'too-large',
            `The file is larger than ${sizeWords(options.maxBytes)}.`,
            [{ path: field, message: `Upload a file of at most ${sizeWords(options.maxBytes)}.` }],
          ),
        );
      }
      const message =
        err instanceof multer.MulterError && err.code === 'LIMIT_UNEXPECTED_FILE'
          ? `Send one file, in the form field "${field}".`
          : 'The upload could not be read. Try again.';
      next(new HttpError(400, 'bad-upload', message, [{ path: field, message }]));
    });
  };
}

/** The uploaded file, or a 400 asking for one. */
export function requireFile(req: Request, field = 'file'): Express.Multer.File {
  if (!req.file) {
    throw new HttpError(400, 'no-file', 'Choose a file to upload.', [
      { path: field, message: 'Choose a file to upload.' },
    ]);
  }
  return req.file;
}
