// Reading the probe credential file the seed writes (shared/schemas/mqtt.schema.ts,
// probeCredentialFileSchema) and working out what changed between two reads.
import { readFile } from 'node:fs/promises';
import { z } from 'zod';
import { type ProbeCredentialFile, probeCredentialFileSchema } from '../shared/schemas/mqtt.schema';

export type ProbeCredential = ProbeCredentialFile['probes'][number];

export type CredentialFileRead =
  { ok: true; file: ProbeCredentialFile } | { ok: false; reason: 'missing' | 'unreadable' | 'invalid'; message: string };

export async function readCredentialFile(path: string): Promise<CredentialFileRead> {
  let text: string;
  try {
    text = await readFile(path, 'utf8');
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code;
    if (code === 'ENOENT') return { ok: false, reason: 'missing', message: `no probe credential file at ${path}` };
    return { ok: false, reason: 'unreadable', message: `cannot read ${path}: ${(error as Error).message}` };
  }
  return parseCredentialFile(text, path);
}

export function parseCredentialFile(text: string, path = 'credential file'): CredentialFileRead {
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (error) {
    return { ok: false, reason: 'invalid', message: `${path} is not JSON: ${(error as Error).message}` };
  }
  const parsed = probeCredentialFileSchema.safeParse(json);
  if (!parsed.success)
    return { ok: false, reason: 'invalid', message: `${path} is not a probe credential file:\n${z.prettifyError(parsed.error)}` };
  return { ok: true, file: parsed.data };
}

export interface CredentialDiff {
  added: ProbeCredential[];
  removed: string[];
  /** Same probe, new secret: reconnect with it. */
  rotated: ProbeCredential[];
  /** Same probe and secret, other fields changed: rebuild its model. */
  changed: ProbeCredential[];
}

const modelFields = (c: ProbeCredential): string =>
  JSON.stringify([
    c.unitKind,
    c.waterType,
    c.salinityPpt,
    c.species,
    c.quantities,
    c.intervalSeconds,
    c.scenario,
    c.temperatureUnit,
    c.farmSlug,
    c.unitCode,
  ]);

export function diffCredentials(current: ReadonlyMap<string, ProbeCredential>, next: readonly ProbeCredential[]): CredentialDiff {
  const diff: CredentialDiff = { added: [], removed: [], rotated: [], changed: [] };
  const seen = new Set<string>();
  for (const entry of next) {
    seen.add(entry.probeKey);
    const before = current.get(entry.probeKey);
    if (!before) diff.added.push(entry);
    else if (before.secret !== entry.secret) diff.rotated.push(entry);
    else if (modelFields(before) !== modelFields(entry)) diff.changed.push(entry);
  }
  for (const key of current.keys()) if (!seen.has(key)) diff.removed.push(key);
  return diff;
}
