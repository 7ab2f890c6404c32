import { createHash, randomBytes, timingSafeEqual } from 'node:crypto';

// Probe secrets are 32 random bytes, so a fast SHA-256 hash is enough (no dictionary to guess from), and
// it keeps broker authentication cheap when hundreds of probes reconnect at once.
export const newProbeSecret = () => randomBytes(24).toString('base64url');
export const hashProbeSecret = (secret: string) => `sha256:${createHash('sha256').update(secret).digest('hex')}`;
export function verifyProbeSecret(secret: string, stored: string): boolean {
  const a = Buffer.from(hashProbeSecret(secret));
  const b = Buffer.from(stored);
  return a.length === b.length && timingSafeEqual(a, b);
}
