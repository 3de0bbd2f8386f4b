/**
 * One text file uploaded as multipart/form-data (multer, memory storage):
 * size-limited, content type checked, and refused when it is not UTF-8 text
 * (NUL bytes or invalid UTF-8: a binary file renamed .csv). Multer's own
 * errors become the API's error shape.
 */
import type { Request, RequestHandler } from 'express';
import multer from 'multer';
import { HttpError } from './errors.js';
import { nulError, nulPaths } from './text.js';

export const UPLOAD_LIMIT_BYTES = 256 * 1024;

/** Routes that take multipart bodies (every other body must be JSON): the hardpoint import and the rig measurement upload. */
export const UPLOAD_ROUTE = /^\/teams\/[^/]+\/(axle-designs\/[^/]+\/import|rig-measurements(\/preview)?)$/;
export const isUploadRequest = (req: Request): boolean => UPLOAD_ROUTE.test(req.path) && Boolean(req.is('multipart/form-data'));

const TEXT_TYPES = new Set(['text/csv', 'text/plain', 'application/json', 'application/vnd.ms-excel', 'text/tab-separated-values']);
// Browsers send these when they do not know the extension; the name and the content decide then.
const UNKNOWN_TYPES = new Set(['', 'application/octet-stream']);

export interface UploadedText {
  name: string;
  text: string;
}

/** Multer middleware for one file in field `fieldName` and up to a few small text fields. */
export function singleTextUpload(fieldName: string, extensions: readonly string[]): RequestHandler {
  const m = multer({
    storage: multer.memoryStorage(),
    limits: { fileSize: UPLOAD_LIMIT_BYTES, files: 1, fields: 4, fieldSize: 64 * 1024, parts: 6 },
  }).single(fieldName);
  const extension = new RegExp(`\\.(${extensions.join('|')})$`, 'i');
  return (req, res, next) => {
    if (!req.is('multipart/form-data')) {
      return next(new HttpError(415, 'unsupported_media_type', `Send the file as multipart/form-data in the field "${fieldName}"`));
    }
    m(req, res, (err: unknown) => {
      if (err instanceof multer.MulterError) {
        if (err.code === 'LIMIT_FILE_SIZE') {
          return next(new HttpError(413, 'payload_too_large', `The file is larger than ${UPLOAD_LIMIT_BYTES / 1024} kB`));
        }
        return next(new HttpError(400, 'invalid_upload', `The upload was refused: ${err.message}${err.field ? ` (${err.field})` : ''}`));
      }
      // The multipart parser's own errors (a body cut short, a broken part header, no boundary) are the client's.
      if (err instanceof Error) return next(new HttpError(400, 'invalid_upload', `The upload could not be read: ${err.message}`));
      if (err) return next(err);
      const file = req.file;
      if (!file) return next(new HttpError(400, 'invalid_upload', `Attach the file in the field "${fieldName}"`));
      // The text fields and the file's name are stored or parsed: no NUL characters (text.ts).
      const nul = [...nulPaths(req.body ?? {}), ...(file.originalname.includes('\u0000') ? [fieldName] : [])];
      if (nul.length) return next(nulError(nul, 'upload fields'));
      const type = file.mimetype.split(';')[0]!.trim().toLowerCase();
      if (!TEXT_TYPES.has(type) && !UNKNOWN_TYPES.has(type)) {
        return next(new HttpError(415, 'unsupported_media_type', `A ${type} file cannot be imported; send ${extensions.map((e) => `.${e}`).join(', ')} text`));
      }
      if (!extension.test(file.originalname)) {
        return next(new HttpError(415, 'unsupported_media_type', `"${file.originalname}" is not a ${extensions.map((e) => `.${e}`).join(', ')} file`));
      }
      next();
    });
  };
}

/**
 * A multipart text field that holds JSON (the column mapping, a CAD frame,
 * a corner): parsed, 400 naming the field when it is not JSON or holds a
 * NUL character in any of its texts.
 */
export function jsonUploadField(field: string, text: string): unknown {
  let value: unknown;
  try {
    value = JSON.parse(text);
  } catch {
    throw new HttpError(400, 'invalid_input', `Invalid upload fields: ${field}: not valid JSON`, { fields: [{ path: field, message: 'not valid JSON' }] });
  }
  const nul = nulPaths(value, [field]);
  if (nul.length) throw nulError(nul, 'upload fields');
  return value;
}

/** The uploaded file as text, or 415 when it is not UTF-8 text. */
export function uploadedText(req: Request): UploadedText {
  const file = req.file;
  if (!file) throw new HttpError(400, 'invalid_upload', 'No file was uploaded');
  const bytes = file.buffer;
  if (bytes.includes(0)) throw new HttpError(415, 'not_text', `"${file.originalname}" is a binary file (it holds NUL bytes), not CSV or JSON text`);
  let text: string;
  try {
    text = new TextDecoder('utf-8', { fatal: true }).decode(bytes);
  } catch {
    throw new HttpError(415, 'not_text', `"${file.originalname}" is not UTF-8 text; save it as UTF-8 CSV or JSON`);
  }
  return { name: file.originalname, text };
}
