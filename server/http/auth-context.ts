import type { Role } from '../../shared/schemas/auth.schema';

export type AuthUser = {
  id: string;
  email: string;
  isAdmin: boolean;
  /** farmId → role on that farm. */
  memberships: Map<string, Exclude<Role, 'admin'>>;
  tokenIssuedAt: number;
  tokenVersion: number;
};

/** The caller's effective role on a farm: admins act as 'admin' on every farm. */
export function roleOnFarm(user: AuthUser, farmId: string): Role | null {
  const role = user.memberships.get(farmId);
  if (role) return role;
  return user.isAdmin ? 'admin' : null;
}
