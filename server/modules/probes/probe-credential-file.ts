import { existsSync, readFileSync } from 'node:fs';
import { probeCredentialFileSchema, type ProbeCredentialFile } from '../../../shared/schemas/mqtt.schema';
import { writeCredentials } from '../../db/seed/seed';

type Entry = ProbeCredentialFile['probes'][number];

/**
 * The probe credential file (config PROBE_CREDENTIALS_FILE, mode 600) that the simulator reads:
 * entries are added, replaced or removed by probe key, keeping the rest (and each entry's scenario).
 * Writes are serialised in this process so two rotations cannot lose each other's entry.
 */
export class ProbeCredentialFileStore {
  private chain: Promise<unknown> = Promise.resolve();

  constructor(
    private readonly file: string,
    private readonly defaultBrokerUrl: string,
  ) {}

  upsert(entry: Omit<Entry, 'scenario'> & { scenario?: string }): Promise<void> {
    return this.update((probes) => {
      const old = probes.find((p) => p.probeKey === entry.probeKey);
      // Fields this server does not know (a scenario, °F reporting) stay as the file had them.
      const next: Entry = { ...old, ...entry, scenario: entry.scenario ?? old?.scenario ?? 'steady' };
      return old ? probes.map((p) => (p.probeKey === entry.probeKey ? next : p)) : [...probes, next];
    });
  }

  remove(probeKey: string): Promise<void> {
    return this.update((probes) => probes.filter((p) => p.probeKey !== probeKey));
  }

  private update(change: (probes: Entry[]) => Entry[]): Promise<void> {
    const run = this.chain.then(() => {
      const current = this.read();
      writeCredentials(this.file, current.brokerUrl, change(current.probes));
    });
    this.chain = run.catch(() => undefined);
    return run;
  }

  private read(): ProbeCredentialFile {
    if (!existsSync(this.file)) return { brokerUrl: this.defaultBrokerUrl, probes: [] };
    const parsed = probeCredentialFileSchema.safeParse(JSON.parse(readFileSync(this.file, 'utf8')));
    // Never overwrite a file we cannot read: it may hold the only copy of other probes' secrets.
    if (!parsed.success) throw new Error(`probe credential file ${this.file} is not in the expected format`);
    return parsed.data;
  }
}
