import type { EntityManager } from 'typeorm';
import type { ProbeCredentialFile } from '../../../shared/schemas/mqtt.schema';

/** Stores simulated probe history for the demo (filled in from the simulator's pond model). */
export async function storeSimulatedHistory(_args: {
  manager: EntityManager;
  probes: Array<{ id: string; entry: ProbeCredentialFile['probes'][number] }>;
  now: Date;
}): Promise<void> {
  // Replaced once the simulator's generateHistory is available.
}
