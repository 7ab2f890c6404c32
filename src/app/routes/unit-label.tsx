import { useParams } from 'react-router';
import { UnitLabel } from '@/features/pondside';
import { useCurrentFarm } from '@/lib/current-farm';

/** /farms/:farmId/units/:unitId/label — the printable QR label of a unit. */
export default function UnitLabelRoute() {
  const current = useCurrentFarm();
  const { unitId } = useParams();
  if (!current || !unitId) return null;
  return <UnitLabel farmId={current.farm.id} unitId={unitId} />;
}
