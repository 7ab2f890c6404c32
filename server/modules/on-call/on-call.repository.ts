import { In, type DataSource } from 'typeorm';
import { Farm, Membership, OnCallEntry, User } from '../../db/entities';
import type { FarmInfo } from '../alerts/ports';
import { defaultFarmSettings } from '../../db/entities';

export type Person = { id: string; name: string; email: string; active: boolean; isAdmin: boolean; role: 'hand' | 'manager' | 'planner' | 'admin' | null };

export class OnCallRepository {
  constructor(private readonly ds: DataSource) {}

  list(farmId: string): Promise<OnCallEntry[]> {
    return this.ds.getRepository(OnCallEntry).find({ where: { farmId }, order: { position: 'ASC' } });
  }

  /** Replaces the farm's list in one transaction (positions 1…n in the given order). */
  async replace(farmId: string, entries: Array<Pick<OnCallEntry, 'userId' | 'startsLocal' | 'endsLocal' | 'weekdays'>>): Promise<OnCallEntry[]> {
    await this.ds.transaction(async (m) => {
      await m.getRepository(OnCallEntry).delete({ farmId });
      if (entries.length) {
        await m.getRepository(OnCallEntry).insert(entries.map((e, i) => ({ ...e, farmId, position: i + 1 })));
      }
    });
    return this.list(farmId);
  }

  /** The people with their role on the farm (admins without a membership count as 'admin'). */
  async people(farmId: string, userIds: string[]): Promise<Map<string, Person>> {
    if (!userIds.length) return new Map();
    const [users, memberships] = await Promise.all([
      this.ds.getRepository(User).findBy({ id: In(userIds) }),
      this.ds.getRepository(Membership).findBy({ farmId, userId: In(userIds) }),
    ]);
    const roles = new Map(memberships.map((m) => [m.userId, m.role]));
    return new Map(
      users.map((u) => [u.id, { id: u.id, name: u.name, email: u.email, active: u.active, isAdmin: u.isAdmin, role: roles.get(u.id) ?? (u.isAdmin ? 'admin' : null) }]),
    );
  }

  /** Active managers of the farm (members with role manager). */
  async managers(farmId: string): Promise<Person[]> {
    const rows = await this.ds.getRepository(Membership).find({ where: { farmId, role: 'manager' }, relations: { user: true } });
    return rows
      .filter((m): m is Membership & { user: User } => Boolean(m.user?.active))
      .map((m) => ({ id: m.user.id, name: m.user.name, email: m.user.email, active: true, isAdmin: m.user.isAdmin, role: 'manager' as const }))
      .sort((a, b) => a.name.localeCompare(b.name));
  }

  // Interim farm look-ups until the farms module's service is wired (see ../alerts/ports.ts).
  async farm(farmId: string): Promise<FarmInfo | null> {
    const f = await this.ds.getRepository(Farm).findOneBy({ id: farmId });
    return f ? { id: f.id, name: f.name, timeZone: f.timeZone, settings: { ...defaultFarmSettings, ...f.settings } } : null;
  }
  async allFarms(): Promise<FarmInfo[]> {
    const farms = await this.ds.getRepository(Farm).find({ order: { name: 'ASC' } });
    return farms.map((f) => ({ id: f.id, name: f.name, timeZone: f.timeZone, settings: { ...defaultFarmSettings, ...f.settings } }));
  }
}
