import type { NextFunction, Request, Response } from 'express';
import multer from 'multer';
import { badRequest, payloadTooLarge } from '../../http/errors';

export const PHOTO_MAX_BYTES = 8 * 1024 * 1024;

/** What the bytes are, from their signature — never from the client's file name or declared type. */
export function sniffImage(buf: Buffer): { contentType: 'image/jpeg' | 'image/png' | 'image/webp'; ext: 'jpg' | 'png' | 'webp' } | null {
  if (buf.length >= 3 && buf[0] === 0xff && buf[1] === 0xd8 && buf[2] === 0xff) return { contentType: 'image/jpeg', ext: 'jpg' };
  if (buf.length >= 8 && buf.subarray(0, 8).equals(Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]))) return { contentType: 'image/png', ext: 'png' };
  if (buf.length >= 12 && buf.subarray(0, 4).toString('ascii') === 'RIFF' && buf.subarray(8, 12).toString('ascii') === 'WEBP') return { contentType: 'image/webp', ext: 'webp' };
  return null;
}

/** Multer in memory for one photo in the field `photo`, with a clear error for size and field mistakes. */
export function photoUpload() {
  const upload = multer({ storage: multer.memoryStorage(), limits: { fileSize: PHOTO_MAX_BYTES, files: 1, fields: 5, parts: 6 } }).single('photo');
  return (req: Request, res: Response, next: NextFunction): void => {
    upload(req, res, (err?: unknown) => {
      if (!err) return next();
      if (err instanceof multer.MulterError && err.code === 'LIMIT_FILE_SIZE') return next(payloadTooLarge(`A photo may be at most ${PHOTO_MAX_BYTES / 1024 / 1024} MB.`));
      if (err instanceof multer.MulterError) return next(badRequest(`Send one image as the form field "photo" (${err.message}).`, undefined, 'photo_field'));
      next(badRequest('The upload was cut off or is not valid multipart form data.', undefined, 'upload_malformed'));
    });
  };
}
