import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { fileTypeFromBuffer } from 'file-type';
import type { Request, RequestHandler } from 'express';
import multer from 'multer';
import { HttpError } from './http-error';

export const MB = 1024 * 1024;

/** A multipart form's file fields: each field name and how many files it may carry (default 1). */
export type UploadFields = { name: string; maxCount?: number }[];

const limitsFor = (maxBytes: number, fields: UploadFields) => ({
  fileSize: maxBytes,
  files: fields.reduce((n, f) => n + (f.maxCount ?? 1), 0),
  fields: 20,
  fieldSize: 64 * 1024,
});

/**
 * Errors of the multipart parser itself are the client's: a form without a boundary, one cut off,
 * a broken part header. They come as plain errors without a code and answer 400 here; errors with a
 * code keep their own answer: the upload limits (MulterError, LIMIT_…) in the error handler, and a
 * system error (ENOSPC…) stays a 500.
 */
function clientErrorsAre400(middleware: RequestHandler): RequestHandler {
  return (req, res, next) =>
    middleware(req, res, (err?: unknown) => {
      const code = (err as { code?: unknown } | undefined)?.code;
      if (!err || typeof code === 'string') return next(err);
      const reason = err instanceof Error ? err.message : String(err);
      next(
        new HttpError('VALIDATION_FAILED', `The upload is not a well-formed multipart form (${reason}).`, [
          { path: '(body)', message: reason },
        ]),
      );
    });
}

/**
 * Files kept in memory, each at most `maxBytes` (larger → 413 through the error handler), for small
 * uploads checked on the request thread (images). Files are checked by content and written to disk
 * by the caller, never as sent.
 */
export function memoryUpload(maxBytes: number, fields: UploadFields): RequestHandler {
  const upload = multer({ storage: multer.memoryStorage(), limits: limitsFor(maxBytes, fields) });
  return clientErrorsAre400(upload.fields(fields));
}

/**
 * Files streamed to temporary files (the request thread never holds a large upload whole), each at
 * most `maxBytes`; for uploads a task worker reads. The files are removed when the response ends,
 * whatever happened; multer removes them itself when the upload fails part way.
 */
export function diskUpload(maxBytes: number, fields: UploadFields): RequestHandler {
  const upload = clientErrorsAre400(
    multer({ storage: multer.diskStorage({}), limits: limitsFor(maxBytes, fields) }).fields(fields),
  );
  return (req, res, next) =>
    upload(req, res, (err?: unknown) => {
      const files = Object.values((req.files ?? {}) as Record<string, Express.Multer.File[]>).flat();
      if (files.length)
        res.once('close', () => {
          // a file the upload stopped in the middle of has no path (multer removed what was written)
          for (const f of files) if (f.path) fs.rm(f.path, { force: true }, () => {});
        });
      next(err);
    });
}

/** The first file of a multipart field, if the form had one. */
export function uploadedFile(req: Request, field: string): Express.Multer.File | undefined {
  return (req.files as Record<string, Express.Multer.File[]> | undefined)?.[field]?.[0];
}

/**
 * Reads a file `diskUpload` stored. One the response has already removed (the client went away
 * while the upload waited its turn) is a 400, not a server fault.
 */
export async function readStoredUpload(filePath: string): Promise<Buffer> {
  try {
    return await fs.promises.readFile(filePath);
  } catch (err) {
    if ((err as NodeJS.ErrnoException).code === 'ENOENT')
      throw new HttpError('VALIDATION_FAILED', 'The upload was cancelled before it could be read.');
    throw err;
  }
}

export interface DetectedType {
  ext: string;
  mime: string;
}

/** The file's type from its first bytes (magic numbers); undefined for text and unknown content. */
export async function sniffFileType(buffer: Uint8Array): Promise<DetectedType | undefined> {
  const found = await fileTypeFromBuffer(buffer);
  return found ? { ext: found.ext, mime: found.mime } : undefined;
}

export const IMAGE_TYPES: Record<string, string> = { 'image/png': 'png', 'image/jpeg': 'jpg' };

/** An attached image's size at the most: a large camera photo fits; a decompression bomb does not. */
export const MAX_IMAGE_SIDE_PX = 12_000;
export const MAX_IMAGE_PIXELS = 50_000_000;

const SOF_MARKERS = new Set([0xc0, 0xc1, 0xc2, 0xc3, 0xc5, 0xc6, 0xc7, 0xc9, 0xca, 0xcb, 0xcd, 0xce, 0xcf]);

/**
 * Width and height as a PNG (its IHDR chunk) or a JPEG (its start-of-frame segment) declares them,
 * read from the header only; null when the header cannot be read.
 */
export function imageDimensions(buffer: Uint8Array, mime: string): { width: number; height: number } | null {
  const view = new DataView(buffer.buffer, buffer.byteOffset, buffer.byteLength);
  if (mime === 'image/png') {
    if (buffer.length < 24) return null;
    return { width: view.getUint32(16), height: view.getUint32(20) };
  }
  if (mime === 'image/jpeg') {
    let i = 2;
    while (i + 9 < buffer.length) {
      if (buffer[i] !== 0xff) return null;
      const marker = buffer[i + 1];
      if (marker === 0xff) {
        i++; // fill byte
        continue;
      }
      if (marker === 0x01 || (marker >= 0xd0 && marker <= 0xd9)) {
        i += 2; // markers without a length
        continue;
      }
      if (SOF_MARKERS.has(marker)) return { height: view.getUint16(i + 5), width: view.getUint16(i + 7) };
      i += 2 + view.getUint16(i + 2);
    }
  }
  return null;
}

/** Refuses anything whose content is not one of `allowed` (the name and the sent mime type are ignored). */
export async function requireImage(
  buffer: Uint8Array,
  allowed: Record<string, string> = IMAGE_TYPES,
): Promise<DetectedType> {
  const found = await sniffFileType(buffer);
  if (!found || !(found.mime in allowed)) {
    const kinds = Object.values(allowed)
      .map((e) => e.toUpperCase())
      .join(' or ');
    throw new HttpError(
      'UNSUPPORTED_MEDIA_TYPE',
      `Only ${kinds} images can be attached; this file's content is ${found ? found.mime : 'not an image'}.`,
    );
  }
  const size = imageDimensions(buffer, found.mime);
  if (!size || size.width === 0 || size.height === 0)
    throw new HttpError(
      'UNSUPPORTED_MEDIA_TYPE',
      `This ${allowed[found.mime].toUpperCase()} image's size cannot be read.`,
    );
  if (
    size.width > MAX_IMAGE_SIDE_PX ||
    size.height > MAX_IMAGE_SIDE_PX ||
    size.width * size.height > MAX_IMAGE_PIXELS
  )
    throw new HttpError(
      'PAYLOAD_TOO_LARGE',
      `The image is ${size.width} × ${size.height} px; images can be at most ${MAX_IMAGE_SIDE_PX} px on a side and ${MAX_IMAGE_PIXELS / 1e6} megapixels.`,
    );
  return { ext: allowed[found.mime], mime: found.mime };
}

/**
 * Reads an uploaded text file (JSON, CSV) as UTF-8. A recognisably binary file (an image, an
 * archive, a PDF…) or bytes that are not UTF-8 text are refused with 415 and a message saying so.
 */
export async function readTextUpload(buffer: Buffer, what: string): Promise<string> {
  const found = await sniffFileType(buffer);
  if (found) {
    throw new HttpError(
      'UNSUPPORTED_MEDIA_TYPE',
      `The ${what} must be a text file; this one is ${found.mime} (.${found.ext}).`,
    );
  }
  if (buffer.includes(0))
    throw new HttpError('UNSUPPORTED_MEDIA_TYPE', `The ${what} must be a text file; this one is binary.`);
  try {
    const text = new TextDecoder('utf-8', { fatal: true }).decode(buffer);
    return text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  } catch {
    throw new HttpError('UNSUPPORTED_MEDIA_TYPE', `The ${what} must be UTF-8 text.`);
  }
}

export function uploadsDir(dataDir: string): string {
  return path.join(dataDir, 'uploads');
}

/** Writes the bytes under DATA_DIR/uploads with a random name; returns that name. */
export function storeUpload(dataDir: string, buffer: Uint8Array, ext: string): string {
  const dir = uploadsDir(dataDir);
  fs.mkdirSync(dir, { recursive: true });
  const storedName = `${crypto.randomBytes(16).toString('hex')}.${ext}`;
  fs.writeFileSync(path.join(dir, storedName), buffer, { flag: 'wx', mode: 0o640 });
  return storedName;
}

/** The path of a stored upload; stored names are ours, but a name with a path in it is still refused. */
export function storedUploadPath(dataDir: string, storedName: string): string {
  if (!/^[a-f0-9]{32}\.[a-z0-9]{1,5}$/.test(storedName)) throw new HttpError('NOT_FOUND', 'File not found');
  return path.join(uploadsDir(dataDir), storedName);
}

export function removeStoredUpload(dataDir: string, storedName: string) {
  fs.rmSync(storedUploadPath(dataDir, storedName), { force: true });
}

/** A display name safe for a header and a file system: no paths, quotes or control characters. */
export function sanitizeFileName(name: string, fallback = 'file'): string {
  const base = name.split(/[\\/]/).pop() ?? '';
  const clean = base
    .normalize('NFKD')
    .replace(/[^A-Za-z0-9._ -]+/g, '_')
    .replace(/^[.\s]+/, '')
    .slice(0, 120)
    .trim();
  return clean || fallback;
}

export function contentDisposition(kind: 'inline' | 'attachment', fileName: string): string {
  const safe = sanitizeFileName(fileName);
  return `${kind}; filename="${safe}"; filename*=UTF-8''${encodeURIComponent(safe)}`;
}
