import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { networkInterfaces } from 'node:os';
import { join } from 'node:path';
import { generate } from 'selfsigned';

/**
 * A self-signed certificate for serving the app over HTTPS on the farm network (a secure context is
 * what lets a phone keep its offline queue). Made once per data folder, for localhost and this
 * machine's current IPv4 addresses; delete the folder to make a new one after an address change.
 */
export async function ensureCertificate(dataDir: string): Promise<{ key: string; cert: string; path: string }> {
  const dir = join(dataDir, 'tls');
  const keyPath = join(dir, 'key.pem');
  const certPath = join(dir, 'cert.pem');
  if (existsSync(keyPath) && existsSync(certPath)) return { key: readFileSync(keyPath, 'utf8'), cert: readFileSync(certPath, 'utf8'), path: dir };
  const ips = Object.values(networkInterfaces())
    .flat()
    .filter((i): i is NonNullable<typeof i> => Boolean(i) && i?.family === 'IPv4')
    .map((i) => i.address);
  const pems = await generate([{ name: 'commonName', value: 'Gillwise (this farm)' }], {
    keyType: 'ec',
    curve: 'P-256',
    algorithm: 'sha256',
    notAfterDate: new Date(Date.now() + 825 * 86_400_000),
    extensions: [
      { name: 'basicConstraints', cA: false },
      { name: 'keyUsage', digitalSignature: true, keyEncipherment: true },
      { name: 'extKeyUsage', serverAuth: true },
      { name: 'subjectAltName', altNames: [{ type: 2, value: 'localhost' }, ...[...new Set(['127.0.0.1', ...ips])].map((ip) => ({ type: 7 as const, ip }))] },
    ],
  });
  mkdirSync(dir, { recursive: true, mode: 0o700 });
  writeFileSync(keyPath, pems.private, { mode: 0o600 });
  writeFileSync(certPath, pems.cert, { mode: 0o644 });
  return { key: pems.private, cert: pems.cert, path: dir };
}
