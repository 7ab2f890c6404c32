import { liveEventTypes } from '@shared/schemas/live.schema';
import type { QueryClient, QueryKey } from '@tanstack/react-query';
import { useQueryClient } from '@tanstack/react-query';
import { useEffect } from 'react';
import { apiUrl } from './api-client';
import { farmScope } from './query-client';

/** What the server sends on /api/farms/:farmId/events (one JSON object per message). */
export interface LiveEvent {
  type: string;
  farmId: string;
  unitId?: string;
  [field: string]: unknown;
}

/** Query-key prefixes to invalidate for one event: fixed, or computed from the event. */
export type LiveEventKeys = readonly QueryKey[] | ((event: LiveEvent) => readonly QueryKey[]);

const bindings = new Map<string, Set<LiveEventKeys>>();

/**
 * Register which query-key prefixes an event type makes stale. Features export their bindings;
 * src/app composes them at start-up (features do not import each other). Returns an unregister function.
 *   registerLiveEvent('alert.opened', (e) => [alertQueries.all(e.farmId)]);
 */
export function registerLiveEvent(type: string, keys: LiveEventKeys): () => void {
  let set = bindings.get(type);
  if (!set) bindings.set(type, (set = new Set()));
  set.add(keys);
  return () => {
    set.delete(keys);
    if (set.size === 0) bindings.delete(type);
  };
}

export function registeredLiveEventTypes(): string[] {
  return [...bindings.keys()];
}

/** The prefixes an event maps to, through every registered binding of its type. */
export function keysForEvent(event: LiveEvent): QueryKey[] {
  const out: QueryKey[] = [];
  for (const keys of bindings.get(event.type) ?? []) out.push(...(typeof keys === 'function' ? keys(event) : keys));
  return out;
}

export function parseLiveEvent(data: unknown): LiveEvent | null {
  if (typeof data !== 'string') return null;
  try {
    const value: unknown = JSON.parse(data);
    if (value && typeof value === 'object') {
      const v = value as Record<string, unknown>;
      if (typeof v.type === 'string' && typeof v.farmId === 'string') return v as LiveEvent;
    }
  } catch {
    /* not JSON: ignore (keep-alive comments never reach onmessage anyway) */
  }
  return null;
}

export interface LiveEventsOptions {
  farmId: string;
  queryClient: QueryClient;
  /** Injected in tests. */
  createEventSource?: (url: string) => EventSource;
  onEvent?: (event: LiveEvent) => void;
}

/**
 * Opens the farm's event stream and invalidates the registered keys on each event. After a dropped
 * connection comes back, everything of the farm is invalidated (events may have been missed).
 */
export function connectLiveEvents({ farmId, queryClient, createEventSource, onEvent }: LiveEventsOptions): () => void {
  if (!createEventSource && typeof EventSource === 'undefined') return () => {};
  const url = apiUrl(`/api/farms/${encodeURIComponent(farmId)}/events`);
  const source = createEventSource ? createEventSource(url) : new EventSource(url, { withCredentials: false });
  let hadError = false;

  source.onopen = () => {
    if (hadError) void queryClient.invalidateQueries({ queryKey: farmScope(farmId) });
    hadError = false;
  };
  source.onerror = () => {
    hadError = true;
  };
  const handle = (message: MessageEvent) => {
    const event = parseLiveEvent(message.data);
    if (!event || event.farmId !== farmId) return;
    for (const queryKey of keysForEvent(event)) void queryClient.invalidateQueries({ queryKey });
    onEvent?.(event);
  };
  // The server names every event (`event: status`, `event: alert`, …); unnamed messages are handled too.
  source.onmessage = handle;
  for (const type of liveEventTypes) source.addEventListener(type, handle as EventListener);
  return () => source.close();
}

/** Keep the farm's live stream open while the component is mounted. */
export function useLiveEvents(farmId: string | undefined): void {
  const queryClient = useQueryClient();
  useEffect(() => {
    if (!farmId) return;
    return connectLiveEvents({ farmId, queryClient });
  }, [farmId, queryClient]);
}
