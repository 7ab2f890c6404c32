import { useAuth } from '@/lib/auth';
import { useCurrentFarm } from '@/lib/current-farm';
import type { AlertPermissions } from '../components/alert-card';

/** What the caller may do with alerts on this farm (the API's rules: hands acknowledge; managers and admins also assign and resolve). */
export function useAlertPermissions(): { can: AlertPermissions; me: { id: string; name: string } | null } {
  const current = useCurrentFarm();
  const { me } = useAuth();
  const role = current?.role;
  const office = role === 'manager' || role === 'admin';
  return {
    can: { acknowledge: office || role === 'hand', assign: office, resolve: office },
    me: me ? { id: me.user.id, name: me.user.name } : null,
  };
}
