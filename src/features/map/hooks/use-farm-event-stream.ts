import { liveEventTypes } from '@shared/schemas/live.schema';
import { useQueryClient } from '@tanstack/react-query';
import { useEffect } from 'react';
import { apiUrl } from '@/lib/api-client';
import { keysForEvent, parseLiveEvent } from '@/lib/live-events';
import { farmScope } from '@/lib/query-client';

/**
 * Listens to the farm's event stream for the named events the server sends (`event: status`, `event:
 * alert`, …) and invalidates the keys registered for each type (src/app/live-bindings.ts).
 *
 * Why here: the shell's connection (src/lib/live-events.ts) handles only unnamed `message` events, and
 * the server names every event, so without this the manager screens would wait for their polling
 * interval. Drop this hook once the shared connection listens for the named types too.
 */
export function useFarmEventStream(farmId: string | undefined): void {
  const queryClient = useQueryClient();
  useEffect(() => {
    if (!farmId || typeof EventSource === 'undefined') return;
    const source = new EventSource(apiUrl(`/api/farms/${encodeURIComponent(farmId)}/events`));
    let dropped = false;
    const onEvent = (message: MessageEvent) => {
      const event = parseLiveEvent(message.data);
      if (!event || event.farmId !== farmId) return;
      for (const queryKey of keysForEvent(event)) void queryClient.invalidateQueries({ queryKey });
    };
    for (const type of liveEventTypes) source.addEventListener(type, onEvent);
    source.onerror = () => {
      dropped = true;
    };
    source.onopen = () => {
      // Events may have been missed while the stream was down.
      if (dropped) void queryClient.invalidateQueries({ queryKey: farmScope(farmId) });
      dropped = false;
    };
    return () => source.close();
  }, [farmId, queryClient]);
}
