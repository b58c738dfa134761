/**
 * Receives the uploaded file (multipart field "file") into memory with a size limit. Runs after
 * the route's permission check, so nobody without data:import can make the server read 50 MB.
 */
import type { Request, Response } from 'express';
import multer from 'multer';
import { PayloadTooLarge, ValidationError } from '../../lib/errors';

export interface ReceivedUpload {
  originalName: string;
  bytes: Buffer;
  fields: Record<string, unknown>;
}

function humanSize(bytes: number): string {
  return bytes >= 1024 * 1024 ? `${Math.round((bytes / 1024 / 1024) * 10) / 10} MB` : `${Math.round(bytes / 1024)} kB`;
}

export async function receiveUpload(req: Request, res: Response, maxBytes: number): Promise<ReceivedUpload> {
  if (!req.is('multipart/form-data')) {
    throw new ValidationError('Send the file as multipart/form-data in a field named "file".', undefined, 'no_file');
  }
  const middleware = multer({ storage: multer.memoryStorage(), limits: { fileSize: maxBytes, files: 1, fields: 20, fieldSize: 1024 } }).single('file');
  try {
    await new Promise<void>((resolve, reject) => middleware(req, res, (error?: unknown) => (error ? reject(error) : resolve())));
  } catch (error) {
    if (error instanceof multer.MulterError) {
      if (error.code === 'LIMIT_FILE_SIZE') {
        throw new PayloadTooLarge('file_too_large', `The file is larger than ${humanSize(maxBytes)}, the most an import accepts. Split it into shorter periods.`);
      }
      throw new ValidationError(`The upload is not valid (${error.message}).`, undefined, 'bad_upload');
    }
    throw new ValidationError('The upload could not be read.', undefined, 'bad_upload');
  }
  const file = req.file;
  if (!file) throw new ValidationError('No file: send it in a multipart field named "file".', undefined, 'no_file');
  // busboy reads file names as latin1; browsers send UTF-8.
  const originalName = Buffer.from(file.originalname, 'latin1').toString('utf8');
  return { originalName, bytes: file.buffer, fields: { ...(req.body as Record<string, unknown>) } };
}
