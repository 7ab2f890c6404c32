import type { DataSource } from 'typeorm';
import { seedDemo, type SeedResult } from '../../server/db/seed/seed';

/** Seeds the invented demo farms (no probe history) into a test database and returns their ids. */
export function seedDemoFarms(ds: DataSource): Promise<SeedResult> {
  return seedDemo(ds, { brokerUrl: 'mqtt://127.0.0.1:0' });
}

export const DEMO_PASSWORD = 'gillwise-demo';
export const demoEmail = (role: 'hand' | 'manager' | 'planner' | 'admin', farm: 'harrowbend' | 'cedarflats' = 'harrowbend') =>
  `${role}@${farm}.example`;
