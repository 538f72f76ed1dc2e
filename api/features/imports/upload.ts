/**
 * Multipart upload for imports: one file in memory, size-limited while it streams in, and the
 * JSON options sent beside it. Keeps the import routes to parse → call → respond.
 */
import type { Request, RequestHandler } from 'express';
import multer from 'multer';
import type { z } from 'zod';
import { BadRequestError, PayloadTooLargeError } from '../../lib/errors';
import { parseBody } from '../../lib/validation';
import { IMPORT_LIMITS, type ImportLimits, type UploadedFile } from './parse';

/** Room for the multipart framing and the JSON options field beside the file. */
const MULTIPART_ALLOWANCE_BYTES = 300 * 1024;

/** Name of the multipart field that carries the file. */
export const UPLOAD_FIELD = 'file';

function megabytes(n: number): string {
  return `${Math.round((n / (1024 * 1024)) * 10) / 10} MB`;
}

/**
 * Middleware accepting one file in the field "file" (plus small text fields). A file over
 * `limits.maxBytes` is cut off while it streams and answered 413, so a 200 MB upload never
 * sits in memory.
 */
export function importUpload(limits: ImportLimits = IMPORT_LIMITS): RequestHandler {
  const upload = multer({
    storage: multer.memoryStorage(),
    limits: { fileSize: limits.maxBytes, files: 1, fields: 10, fieldSize: 256 * 1024, parts: 12 },
  }).single(UPLOAD_FIELD);
  const tooLarge = () =>
    new PayloadTooLargeError(
      `The file is larger than ${megabytes(limits.maxBytes)}, the largest accepted. Split it, or remove columns you do not need.`,
    );
  return (req, res, next) => {
    // A declared size over the limit is refused before a byte is read; the connection is closed
    // rather than drained. Without a declared size multer counts while it streams (and drains).
    const declared = Number(req.headers['content-length']);
    if (Number.isFinite(declared) && declared > limits.maxBytes + MULTIPART_ALLOWANCE_BYTES) {
      res.set('Connection', 'close');
      return next(tooLarge());
    }
    upload(req, res, (err: unknown) => {
      if (!err) return next();
      if (err instanceof multer.MulterError) {
        if (err.code === 'LIMIT_FILE_SIZE') return next(tooLarge());
        if (err.code === 'LIMIT_UNEXPECTED_FILE' || err.code === 'LIMIT_FILE_COUNT') {
          return next(
            new BadRequestError(`Send exactly one file, in the form field "${UPLOAD_FIELD}".`, [
              { path: UPLOAD_FIELD, message: 'one file expected here' },
            ]),
          );
        }
        return next(new BadRequestError(`The upload was not accepted: ${err.message.toLowerCase()}.`));
      }
      if (err instanceof Error && /multipart|boundary/i.test(err.message)) {
        return next(new BadRequestError('The upload is not a valid multipart/form-data request.'));
      }
      next(err);
    });
  };
}

/** The uploaded file, or a 400 naming the field when none was sent. */
export function uploadedFile(req: Request): UploadedFile {
  const file = req.file;
  if (!file)
    throw new BadRequestError(`No file was uploaded; send it in the form field "${UPLOAD_FIELD}".`, [
      { path: UPLOAD_FIELD, message: 'a file is required' },
    ]);
  return { name: file.originalname, buffer: file.buffer };
}

/**
 * A JSON-encoded text field of the multipart body, checked with `schema`. A missing field is
 * read as `{}` so that schemas with defaults work; field errors are prefixed with its name.
 */
export function jsonField<S extends z.ZodType>(req: Request, field: string, schema: S): z.output<S> {
  const raw = (req.body as Record<string, unknown> | undefined)?.[field];
  let value: unknown = {};
  if (typeof raw === 'string' && raw.trim() !== '') {
    try {
      value = JSON.parse(raw);
    } catch {
      throw new BadRequestError(`The form field "${field}" is not valid JSON.`, [{ path: field, message: 'not valid JSON' }]);
    }
  } else if (raw !== undefined && typeof raw !== 'string') {
    throw new BadRequestError(`The form field "${field}" must be a JSON string.`, [{ path: field, message: 'expected a JSON string' }]);
  }
  return parseBody(schema, value, [field]);
}
