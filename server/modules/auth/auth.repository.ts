import { IsNull, MoreThan, type DataSource } from 'typeorm';
import { Farm, Membership, PasswordResetToken, User } from '../../db/entities';

export class AuthRepository {
  constructor(private readonly ds: DataSource) {}

  findUserByEmail(email: string): Promise<User | null> {
    return this.ds.getRepository(User).findOneBy({ email: email.trim().toLowerCase() });
  }
  findUserById(id: string): Promise<User | null> {
    return this.ds.getRepository(User).findOneBy({ id });
  }
  membershipsOf(userId: string): Promise<Membership[]> {
    return this.ds.getRepository(Membership).findBy({ userId });
  }
  async farmsOf(user: User): Promise<Array<{ farm: Farm; role: string }>> {
    if (user.isAdmin) {
      const farms = await this.ds.getRepository(Farm).find({ order: { name: 'ASC' } });
      const memberships = new Map((await this.membershipsOf(user.id)).map((m) => [m.farmId, m.role]));
      return farms.map((farm) => ({ farm, role: memberships.get(farm.id) ?? 'admin' }));
    }
    const rows = await this.ds.getRepository(Membership).find({ where: { userId: user.id }, relations: { farm: true } });
    return rows
      .filter((m): m is Membership & { farm: Farm } => Boolean(m.farm))
      .map((m) => ({ farm: m.farm, role: m.role }))
      .sort((a, b) => a.farm.name.localeCompare(b.farm.name));
  }
  async touchLogin(userId: string): Promise<void> {
    await this.ds.getRepository(User).update({ id: userId }, { lastLoginAt: new Date() });
  }
  async saveUser(user: User): Promise<User> {
    return this.ds.getRepository(User).save(user);
  }
  async createToken(row: Pick<PasswordResetToken, 'userId' | 'tokenHash' | 'purpose' | 'expiresAt'>): Promise<void> {
    await this.ds.getRepository(PasswordResetToken).insert(row);
  }
  findUsableToken(tokenHash: string): Promise<PasswordResetToken | null> {
    return this.ds.getRepository(PasswordResetToken).findOneBy({ tokenHash, usedAt: IsNull(), expiresAt: MoreThan(new Date()) });
  }
  /** Marks the token used and sets the password in one transaction; false if the token was taken meanwhile. */
  async consumeTokenAndSetPassword(tokenId: string, userId: string, passwordHash: string): Promise<boolean> {
    return this.ds.transaction(async (m) => {
      const res = await m.getRepository(PasswordResetToken).update({ id: tokenId, usedAt: IsNull() }, { usedAt: new Date() });
      if (!res.affected) return false;
      await m
        .getRepository(User)
        .createQueryBuilder()
        .update()
        .set({ passwordHash, tokenVersion: () => 'token_version + 1' })
        .where('id = :userId', { userId })
        .execute();
      return true;
    });
  }
}
