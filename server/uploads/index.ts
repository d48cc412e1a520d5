/** Upload helpers shared by every route that takes a file (part photos, attachments, CSV). */
export { isUtf8Text, sniffUpload, TEXT_TYPES, typeWords } from './sniff.js';
export { requireFile, singleFileUpload, sizeWords, type UploadOptions } from './multer.js';
