/**
 * Reading the permit PDF from a multipart request. It runs inside the route handler, after the
 * pipeline has checked the session, the permission and the permit, so nobody can make the
 * server buffer 20 MB without being allowed to upload.
 */
import type { Request, Response } from 'express';
import multer from 'multer';
import { AppError, PayloadTooLarge, ValidationError } from '../../lib/errors';
import { MAX_PERMIT_DOCUMENT_BYTES } from './permits.schemas';
import { isPdf } from './permits.service';

const upload = multer({
  storage: multer.memoryStorage(),
  // browsers send UTF-8 file names without a charset parameter (WHATWG HTML form submission)
  defParamCharset: 'utf8',
  limits: { fileSize: MAX_PERMIT_DOCUMENT_BYTES, files: 1, fields: 5, parts: 6 },
}).single('file');

export class UnsupportedMediaType extends AppError {
  constructor(message: string) {
    super(415, 'unsupported_media_type', message);
  }
}

/** The uploaded PDF, or a 400 / 413 / 415 error. */
export async function readPermitPdf(req: Request, res: Response): Promise<{ originalName: string; content: Buffer }> {
  if (!req.is('multipart/form-data')) {
    throw new ValidationError('Send the permit as multipart/form-data with the PDF in the field "file".', [
      { location: 'body', path: 'file', message: 'Required' },
    ], 'file_missing');
  }
  await new Promise<void>((resolve, reject) => {
    upload(req, res, (error: unknown) => {
      if (!error) return resolve();
      if (error instanceof multer.MulterError && error.code === 'LIMIT_FILE_SIZE') {
        return reject(new PayloadTooLarge('file_too_large', `The permit document may be at most ${MAX_PERMIT_DOCUMENT_BYTES / 1024 / 1024} MB.`));
      }
      if (error instanceof multer.MulterError) {
        return reject(new ValidationError('The upload is not valid.', [{ location: 'body', path: error.field ?? 'file', message: error.message }], 'invalid_upload'));
      }
      reject(error);
    });
  });
  const file = req.file;
  if (!file) {
    throw new ValidationError('No file in the field "file".', [{ location: 'body', path: 'file', message: 'Required' }], 'file_missing');
  }
  // The content decides, not the declared type or the file name.
  if (!isPdf(file.buffer)) throw new UnsupportedMediaType('The permit document must be a PDF file.');
  return { originalName: file.originalname, content: file.buffer };
}
