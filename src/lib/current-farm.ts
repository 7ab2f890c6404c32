import type { MeFarm, Role } from '@shared/schemas/auth.schema';
import { useParams } from 'react-router';
import { findFarm, roleOnFarm, useAuth } from './auth';

export interface CurrentFarm {
  farm: MeFarm;
  role: Role;
}

/** The farm named by :farmId in the URL, if the signed-in user belongs to it, and their role there. */
export function useCurrentFarm(): CurrentFarm | null {
  const { farmId } = useParams();
  const { me } = useAuth();
  const farm = findFarm(me, farmId);
  if (!me || !farm) return null;
  return { farm, role: roleOnFarm(me, farm) };
}
