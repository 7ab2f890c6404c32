import { useMemo } from 'react';
import { NightRound, type NightRoundSender } from '@/features/night-round';
import { newClientId, OutboxList, outbox, useOutboxEntries, useOutboxSync, waterTestsPath } from '@/features/pondside';
import { useAuth } from '@/lib/auth';
import { useCurrentFarm } from '@/lib/current-farm';

const DEFAULT_PREFS = { temperatureUnit: 'C', concentrationUnit: 'mg/L', ammoniaBasis: 'nh3' } as const;

/** /farms/:farmId/night-round — readings go through the device outbox like a pondside test. */
export default function NightRoundRoute() {
  const current = useCurrentFarm();
  const { me } = useAuth();
  useOutboxSync();
  const entries = useOutboxEntries();
  const farmId = current?.farm.id ?? '';
  const userId = me?.user.id ?? '';
  const mine = useMemo(() => entries.filter((e) => e.farmId === farmId && e.userId === userId), [entries, farmId, userId]);
  const sender = useMemo<NightRoundSender>(
    () => ({
      send: async ({ unitId, unitCode, unitName, body }) => {
        const id = newClientId();
        await outbox.add({
          id,
          farmId,
          unitId,
          userId,
          kind: 'water-test',
          path: waterTestsPath(farmId, unitId),
          body: { ...body, clientId: id },
          unitCode,
          unitName,
        });
        return id;
      },
      pendingIds: new Set(mine.filter((e) => e.state !== 'rejected').map((e) => e.id)),
      refusedIds: new Set(mine.filter((e) => e.state === 'rejected').map((e) => e.id)),
    }),
    [mine, farmId, userId],
  );
  if (!current) return null;
  return (
    <NightRound
      farmId={farmId}
      timeZone={current.farm.timeZone}
      prefs={me?.user.prefs ?? DEFAULT_PREFS}
      sender={sender}
      outbox={<OutboxList entries={mine} timeZone={current.farm.timeZone} />}
    />
  );
}
