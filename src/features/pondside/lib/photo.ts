import type { OutboxPhoto } from './outbox';

/** Longest side of a photo sent from the pond: enough to read a colour card, small enough for one bar of signal. */
const MAX_SIDE_PX = 1600;
const JPEG_QUALITY = 0.82;

/**
 * A camera photo made ready for the outbox: shrunk to at most 1600 px and re-encoded as JPEG where the
 * browser can (a 6 MB phone photo becomes a few hundred kB), kept as bytes so IndexedDB stores it
 * everywhere. Browsers without canvas support send the original.
 */
export async function photoForOutbox(file: Blob, name = 'photo.jpg'): Promise<OutboxPhoto> {
  const shrunk = await shrink(file).catch(() => null);
  const blob = shrunk ?? file;
  return { bytes: await blob.arrayBuffer(), type: blob.type || 'image/jpeg', name: shrunk ? name.replace(/\.[^.]+$/, '') + '.jpg' : name };
}

async function shrink(file: Blob): Promise<Blob | null> {
  if (typeof createImageBitmap !== 'function' || typeof document === 'undefined') return null;
  const bitmap = await createImageBitmap(file);
  const scale = Math.min(1, MAX_SIDE_PX / Math.max(bitmap.width, bitmap.height));
  if (scale === 1 && file.size < 1_500_000) {
    bitmap.close();
    return null;
  }
  const canvas = document.createElement('canvas');
  canvas.width = Math.round(bitmap.width * scale);
  canvas.height = Math.round(bitmap.height * scale);
  const ctx = canvas.getContext('2d');
  if (!ctx) return null;
  ctx.drawImage(bitmap, 0, 0, canvas.width, canvas.height);
  bitmap.close();
  return new Promise((resolve) => canvas.toBlob((b) => resolve(b), 'image/jpeg', JPEG_QUALITY));
}
