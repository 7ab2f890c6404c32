import { useQueryClient } from '@tanstack/react-query';
import { useEffect, useSyncExternalStore } from 'react';
import { meQuery, useAuth } from '@/lib/auth';
import { farmScope } from '@/lib/query-client';
import { outbox as deviceOutbox, type Outbox, type OutboxEntry, type SentRecord } from '../lib/outbox';

/** Every entry still on this device, oldest first; re-renders on each change. */
export function useOutboxEntries(box: Outbox = deviceOutbox): readonly OutboxEntry[] {
  return useSyncExternalStore(box.subscribe, box.getSnapshot, box.getSnapshot);
}

/** The server's answer for an entry sent during this visit (the entry leaves the list when it is stored). */
export function useSentRecord(id: string | null, box: Outbox = deviceOutbox): SentRecord | undefined {
  useOutboxEntries(box);
  return id ? box.sentFor(id) : undefined;
}

/**
 * Keeps the outbox sending while a crew screen is open: it follows the signed-in user, and when the
 * server answers 401 it asks who is signed in, so the app sends the hand to sign in (the entries wait).
 */
export function useOutboxSync(box: Outbox = deviceOutbox): void {
  const { me } = useAuth();
  const queryClient = useQueryClient();
  const userId = me?.user.id ?? null;
  const entries = useOutboxEntries(box);
  const signedOut = entries.some((e) => e.state === 'signed-out' && e.userId === userId);

  useEffect(() => {
    box.start();
  }, [box]);
  // A stored entry changes what the farm's screens show; refresh once a burst of sends settles.
  useEffect(() => {
    let timer: ReturnType<typeof setTimeout> | null = null;
    const farms = new Set<string>();
    const off = box.onSent((r) => {
      farms.add(r.entry.farmId);
      if (timer) clearTimeout(timer);
      timer = setTimeout(() => {
        for (const farmId of farms) void queryClient.invalidateQueries({ queryKey: farmScope(farmId) });
        farms.clear();
      }, 400);
    });
    return () => {
      off();
      if (timer) clearTimeout(timer);
    };
  }, [box, queryClient]);
  useEffect(() => {
    box.setActiveUser(userId);
  }, [box, userId]);
  useEffect(() => {
    if (!signedOut || !userId) return;
    // Still signed in after asking (the 401 was a fluke)? Then send again; otherwise the shell asks for a sign-in.
    void queryClient.refetchQueries({ queryKey: meQuery.queryKey }).then(() => {
      if (queryClient.getQueryData(meQuery.queryKey)?.user.id === userId) box.setActiveUser(userId);
    });
  }, [box, signedOut, userId, queryClient]);
}
