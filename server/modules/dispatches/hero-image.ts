import { imageSize } from 'image-size';
import { imageMissing, imageNotSupported, imageTooLarge, imageTooManyPixels } from './dispatches.errors';

export type SniffedImage = { contentType: string; ext: string; width: number; height: number };

/** The type from the file's first bytes (never from its name or the browser's claim). */
export function sniffImageType(bytes: Uint8Array): { contentType: string; ext: string } | null {
  const b = bytes;
  if (b.length >= 8 && b[0] === 0x89 && b[1] === 0x50 && b[2] === 0x4e && b[3] === 0x47 && b[4] === 0x0d && b[5] === 0x0a)
    return { contentType: 'image/png', ext: 'png' };
  if (b.length >= 3 && b[0] === 0xff && b[1] === 0xd8 && b[2] === 0xff) return { contentType: 'image/jpeg', ext: 'jpg' };
  if (b.length >= 6 && String.fromCharCode(...b.subarray(0, 6)).match(/^GIF8[79]a$/)) return { contentType: 'image/gif', ext: 'gif' };
  if (b.length >= 12 && String.fromCharCode(...b.subarray(0, 4)) === 'RIFF' && String.fromCharCode(...b.subarray(8, 12)) === 'WEBP')
    return { contentType: 'image/webp', ext: 'webp' };
  return null;
}

/** Checks an uploaded hero image: real type, byte size, pixel count. Throws a typed error naming the limit. */
export function checkHeroImage(bytes: Buffer | undefined, limits: { maxBytes: number; maxPixels: number }): SniffedImage {
  if (!bytes || bytes.length === 0) throw imageMissing();
  if (bytes.length > limits.maxBytes) throw imageTooLarge(limits.maxBytes);
  const type = sniffImageType(bytes);
  if (!type) {
    const head = bytes.subarray(0, 16).toString('latin1');
    throw imageNotSupported(/<svg|<\?xml/i.test(head) ? 'SVG can carry scripts, so it is not accepted' : 'unknown signature');
  }
  let dims: { width?: number; height?: number };
  try {
    dims = imageSize(bytes);
  } catch (err) {
    throw imageNotSupported(`its header cannot be read: ${(err as Error).message}`);
  }
  const width = dims.width ?? 0;
  const height = dims.height ?? 0;
  if (width < 1 || height < 1) throw imageNotSupported('it has no size');
  if (width * height > limits.maxPixels) throw imageTooManyPixels(width, height, limits.maxPixels);
  return { ...type, width, height };
}
