import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { fileTypeFromBuffer } from 'file-type';
import multer from 'multer';
import { HttpError } from './http-error';

export const MB = 1024 * 1024;

/**
 * A multer instance that keeps files in memory, capped at `maxBytes` each (larger → 413 through
 * the error handler). Files are checked by content and written to disk by the caller, never as sent.
 */
export function memoryUpload(maxBytes: number, maxFiles = 2) {
  return multer({
    storage: multer.memoryStorage(),
    limits: { fileSize: maxBytes, files: maxFiles, fields: 20, fieldSize: 64 * 1024 },
  });
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
