import { TreatmentsScreen } from '@/features/treatments';
import { useCurrentFarm } from '@/lib/current-farm';

/** /farms/:farmId/treatments */
export default function TreatmentsRoute() {
  const current = useCurrentFarm();
  if (!current) return null;
  return <TreatmentsScreen key={current.farm.id} farmId={current.farm.id} timeZone={current.farm.timeZone} />;
}
