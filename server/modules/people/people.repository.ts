import type { DataSource, EntityManager } from 'typeorm';
import { Membership, User } from '../../db/entities';

export class PeopleRepository {
  constructor(private readonly ds: DataSource) {}
  transaction<T>(fn: (m: EntityManager) => Promise<T>): Promise<T> {
    return this.ds.transaction(fn);
  }
  async members(farmId: string): Promise<Array<{ membership: Membership; user: User }>> {
    const rows = await this.ds.getRepository(Membership).find({ where: { farmId }, relations: { user: true }, order: { createdAt: 'ASC' } });
    return rows.filter((m): m is Membership & { user: User } => Boolean(m.user)).map((m) => ({ membership: m, user: m.user }));
  }
  member(farmId: string, userId: string): Promise<Membership | null> {
    return this.ds.getRepository(Membership).findOne({ where: { farmId, userId }, relations: { user: true } });
  }
  userByEmail(m: EntityManager, email: string): Promise<User | null> {
    return m.getRepository(User).findOneBy({ email });
  }
  createUser(m: EntityManager, u: Pick<User, 'email' | 'name' | 'locale'>): Promise<User> {
    return m.getRepository(User).save(m.getRepository(User).create({ ...u, passwordHash: null, isAdmin: false, prefs: {}, active: true }));
  }
  addMembership(m: EntityManager, farmId: string, userId: string, role: Membership['role']): Promise<Membership> {
    return m.getRepository(Membership).save(m.getRepository(Membership).create({ farmId, userId, role }));
  }
  saveMembership(membership: Membership): Promise<Membership> {
    return this.ds.getRepository(Membership).save(membership);
  }
  /** Deactivating a person ends their sessions at once (token version) on every farm. */
  async setActive(userId: string, active: boolean): Promise<void> {
    await this.ds.query(`UPDATE users SET active = $2, token_version = token_version + 1 WHERE id = $1`, [userId, active]);
  }
}
