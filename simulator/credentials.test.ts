import { describe, expect, it } from 'vitest';
import { type ProbeCredential, diffCredentials, parseCredentialFile } from './credentials';

const entry = (probeKey: string, extra: Partial<ProbeCredential> = {}): ProbeCredential => ({
  probeKey,
  secret: `secret-${probeKey}`,
  farmSlug: 'harrow-bend',
  unitCode: probeKey.toUpperCase(),
  unitKind: 'pond',
  waterType: 'fresh',
  salinityPpt: 0.2,
  species: 'channel catfish',
  quantities: ['ph', 'dissolved_oxygen'],
  intervalSeconds: 60,
  scenario: 'steady',
  ...extra,
});

describe('credential file', () => {
  it('parses a valid file and fills the default scenario', () => {
    const { scenario: _s, ...withoutScenario } = entry('pond-1');
    const read = parseCredentialFile(JSON.stringify({ brokerUrl: 'mqtt://127.0.0.1:1883', probes: [withoutScenario] }));
    expect(read.ok && read.file.probes[0]?.scenario).toBe('steady');
  });

  it('explains what is wrong with an invalid file', () => {
    const read = parseCredentialFile(JSON.stringify({ brokerUrl: 'x', probes: [{ probeKey: 'p' }] }), 'probes.json');
    expect(read.ok).toBe(false);
    if (!read.ok) {
      expect(read.reason).toBe('invalid');
      expect(read.message).toContain('probes.json');
      expect(read.message).toContain('secret');
    }
    expect(parseCredentialFile('{', 'probes.json')).toMatchObject({ ok: false, reason: 'invalid' });
  });

  it('a re-read finds added, removed, rotated and changed probes', () => {
    const current = new Map([
      ['pond-1', entry('pond-1')],
      ['pond-2', entry('pond-2')],
      ['pond-3', entry('pond-3')],
      ['pond-4', entry('pond-4')],
    ]);
    const diff = diffCredentials(current, [
      entry('pond-1'),
      entry('pond-2', { secret: 'new' }),
      entry('pond-3', { scenario: 'drift' }),
      entry('pond-5'),
    ]);
    expect(diff.added.map((e) => e.probeKey)).toEqual(['pond-5']);
    expect(diff.removed).toEqual(['pond-4']);
    expect(diff.rotated.map((e) => e.probeKey)).toEqual(['pond-2']);
    expect(diff.changed.map((e) => e.probeKey)).toEqual(['pond-3']);
  });
});
