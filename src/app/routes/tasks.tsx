import { useNavigate } from 'react-router';
import { farmPath } from '@/config/paths';
import { OutboxList, useOutboxEntries, useOutboxSync } from '@/features/pondside';
import { TaskBoard } from '@/features/tasks';
import { useAuth } from '@/lib/auth';
import { useCurrentFarm } from '@/lib/current-farm';

/** /farms/:farmId/tasks — the hand's landing page, with whatever is still waiting on the phone. */
export default function TasksRoute() {
  const current = useCurrentFarm();
  const { me } = useAuth();
  const navigate = useNavigate();
  useOutboxSync();
  const entries = useOutboxEntries();
  if (!current) return null;
  const farmId = current.farm.id;
  const mine = entries.filter((e) => e.farmId === farmId && e.userId === me?.user.id);
  return (
    <TaskBoard
      farmId={farmId}
      timeZone={current.farm.timeZone}
      testHref={(unitId) => farmPath('unitTest', farmId, { unitId })}
      nightRoundHref={farmPath('nightRound', farmId)}
      outbox={
        <OutboxList
          entries={mine}
          timeZone={current.farm.timeZone}
          onFix={(e) => void navigate(`${farmPath('pondside', farmId)}?fix=${encodeURIComponent(e.id)}`)}
        />
      }
    />
  );
}
