import { useMemo } from 'react';
import { ObservationsScreen, observationsPath, type ObservationSender } from '@/features/observations';
import { newClientId, OutboxList, outbox, photoForOutbox, useOutboxEntries, useOutboxSync } from '@/features/pondside';
import { useAuth } from '@/lib/auth';
import { useCurrentFarm } from '@/lib/current-farm';

/** /farms/:farmId/observations — observations go through the device outbox (idempotent by client id). */
export default function ObservationsRoute() {
  const current = useCurrentFarm();
  const { me } = useAuth();
  useOutboxSync();
  const entries = useOutboxEntries();
  const farmId = current?.farm.id ?? '';
  const userId = me?.user.id ?? '';
  const mine = useMemo(() => entries.filter((e) => e.farmId === farmId && e.userId === userId), [entries, farmId, userId]);
  const sender = useMemo<ObservationSender>(
    () => ({
      newId: newClientId,
      send: async ({ unitId, unitCode, unitName, body, photo }) => {
        await outbox.add({
          id: body.clientId,
          farmId,
          unitId,
          userId,
          kind: 'observation',
          path: observationsPath(farmId, unitId),
          body,
          unitCode,
          unitName,
          photo: photo ? await photoForOutbox(photo, photo.name) : null,
        });
      },
      pendingIds: new Set(mine.filter((e) => e.state !== 'rejected').map((e) => e.id)),
      refusedIds: new Set(mine.filter((e) => e.state === 'rejected').map((e) => e.id)),
      sentBody: (id) => outbox.sentFor(id)?.body,
    }),
    [mine, farmId, userId],
  );
  if (!current) return null;
  return (
    <ObservationsScreen
      key={farmId}
      farmId={farmId}
      timeZone={current.farm.timeZone}
      sender={sender}
      outbox={<OutboxList entries={mine} timeZone={current.farm.timeZone} />}
    />
  );
}
