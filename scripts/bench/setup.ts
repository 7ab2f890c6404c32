// Benchmark fixtures: migrate the bench database, seed the invented demo farms, and give every simulated
// probe its own credential (the same code path as tests/factories/probes.ts createProbe). Writes a JSON
// file the runner and the load generator read. Run by scripts/bench/run.mjs through tsx.
import 'reflect-metadata';
import { writeFileSync } from 'node:fs';
import { createDataSource } from '../../server/db/data-source';
import { Probe } from '../../server/db/entities';
import { runMigrations } from '../../server/db/migrate';
import { seedDemo } from '../../server/db/seed/seed';
import { hashProbeSecret, newProbeSecret } from '../../server/modules/probes/probe-secrets';

const [databaseUrl, probeCountArg, outFile] = process.argv.slice(2);
if (!databaseUrl || !probeCountArg || !outFile) throw new Error('usage: setup.ts <databaseUrl> <probes> <out.json>');
const probeCount = Number(probeCountArg);

await runMigrations(databaseUrl);
const ds = createDataSource(databaseUrl, { poolSize: 4 });
await ds.initialize();
const seed = await seedDemo(ds, { brokerUrl: 'mqtt://127.0.0.1:0' });
const farmId = seed.farms['harrow-bend'];
if (!farmId) throw new Error('seed did not create Harrow Bend');
const unitIds = Object.entries(seed.units)
  .filter(([k]) => k.startsWith('harrow-bend:'))
  .map(([, v]) => v);

const quantities = ['ph', 'water_temperature', 'dissolved_oxygen', 'salinity'] as Probe['quantities'];
const probes: Array<{ probeId: string; probeKey: string; secret: string; unitId: string }> = [];
const repo = ds.getRepository(Probe);
for (let i = 0; i < probeCount; i++) {
  const secret = newProbeSecret();
  const probeKey = `bench-${String(i).padStart(5, '0')}`;
  const unitId = unitIds[i % unitIds.length]!;
  const probe = await repo.save(
    repo.create({
      farmId,
      unitId,
      probeKey,
      label: `bench probe ${i}`,
      quantities,
      intervalSeconds: 60,
      secretHash: hashProbeSecret(secret),
      secretRotatedAt: new Date(),
      active: true,
    }),
  );
  probes.push({ probeId: probe.id, probeKey, secret, unitId });
}
writeFileSync(outFile, JSON.stringify({ farmId, unitIds, probes, hand: 'hand@harrowbend.example', password: 'gillwise-demo' }));
await ds.destroy();
