import { useNavigate, useParams, useSearchParams } from 'react-router';
import { farmPath } from '@/config/paths';
import { PondsideTest } from '@/features/pondside';
import { useCurrentFarm } from '@/lib/current-farm';

/** /farms/:farmId/test and /farms/:farmId/units/:unitId/test (QR labels add ?label=). */
export default function PondsideRoute() {
  const current = useCurrentFarm();
  const { unitId } = useParams();
  const [params] = useSearchParams();
  const navigate = useNavigate();
  if (!current) return null;
  const farmId = current.farm.id;
  return (
    <PondsideTest
      key={farmId}
      farmId={farmId}
      timeZone={current.farm.timeZone}
      unitIdFromUrl={unitId}
      labelId={params.get('label')}
      fixId={params.get('fix')}
      // On a unit's own address, follow the chosen unit so a reload comes back to it.
      onUnitChange={unitId ? (id) => void navigate(farmPath('unitTest', farmId, { unitId: id }), { replace: true }) : undefined}
      labelHref={(id) => farmPath('unitLabel', farmId, { unitId: id })}
    />
  );
}
