import { RoleHome } from '../home/role-home';
import { useAuth } from '@/lib/auth';
import { useCurrentFarm } from '@/lib/current-farm';

export default function FarmHomeRoute() {
  const { me } = useAuth();
  const current = useCurrentFarm();
  if (!me || !current) return null;
  return <RoleHome me={me} farm={current.farm} role={current.role} />;
}
