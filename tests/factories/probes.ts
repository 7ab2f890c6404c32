import { randomUUID } from 'node:crypto';
import type { DataSource } from 'typeorm';
import { Probe } from '../../server/db/entities';
import { hashProbeSecret, newProbeSecret } from '../../server/modules/probes/probe-secrets';

/** A probe with a fresh credential on the given unit; returns its key and (only copy of the) secret. */
export async function createProbe(ds: DataSource, farmId: string, unitId: string, quantities: string[] = ['ph', 'water_temperature', 'dissolved_oxygen']) {
  const secret = newProbeSecret();
  const probeKey = `t-${randomUUID().slice(0, 12)}`;
  const probe = await ds.getRepository(Probe).save(
    ds.getRepository(Probe).create({
      farmId,
      unitId,
      probeKey,
      label: `test probe ${probeKey}`,
      quantities: quantities as Probe['quantities'],
      intervalSeconds: 60,
      secretHash: hashProbeSecret(secret),
      secretRotatedAt: new Date(),
      active: true,
    }),
  );
  return { probeId: probe.id, probeKey, secret };
}
