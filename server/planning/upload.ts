/**
 * Attachment file names: what is stored and sent back. Reading the upload and sniffing its type
 * are the shared helpers of server/uploads.
 */

/** MIME types accepted for attachments and the file name extensions that go with each. */
export const ATTACHMENT_EXTENSIONS: Record<string, readonly string[]> = {
  'application/pdf': ['pdf'],
  'image/png': ['png'],
  'image/jpeg': ['jpg', 'jpeg'],
  'image/webp': ['webp'],
};

/**
 * A file name safe to store and send back: no folders, no control or direction-changing
 * characters (which can disguise "gpj.exe" as "exe.jpg"), at most 200 characters, and an
 * extension that matches what the bytes are.
 */
export function safeFilename(original: string, mime: string): string {
  const base = original.normalize('NFC').split(/[\\/]/).pop() ?? '';
  let name = base
    // Control and bidirectional-override characters are exactly what this strips.
    // eslint-disable-next-line no-control-regex
    .replace(/[\u0000-\u001f\u007f-\u009f\u200e\u200f\u202a-\u202e\u2066-\u2069]/g, '')
    .trim()
    .slice(0, 200);
  if (name === '' || name === '.' || name === '..') name = 'attachment';
  const extensions = ATTACHMENT_EXTENSIONS[mime] ?? [];
  const ext = /\.([^.]+)$/.exec(name)?.[1]?.toLowerCase();
  if (extensions.length && (!ext || !extensions.includes(ext))) name = `${name}.${extensions[0]}`;
  return name;
}
