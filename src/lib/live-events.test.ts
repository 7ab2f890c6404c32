import { QueryClient } from '@tanstack/react-query';
import { describe, expect, it, vi } from 'vitest';
import { connectLiveEvents, keysForEvent, registerLiveEvent } from './live-events';
import { farmKey } from './query-client';

class FakeEventSource {
  onopen: (() => void) | null = null;
  onerror: (() => void) | null = null;
  onmessage: ((m: MessageEvent) => void) | null = null;
  closed = false;
  readonly named = new Map<string, Array<(m: MessageEvent) => void>>();
  constructor(readonly url: string) {}
  addEventListener(type: string, listener: (m: MessageEvent) => void) {
    this.named.set(type, [...(this.named.get(type) ?? []), listener]);
  }
  emit(data: unknown) {
    this.onmessage?.({ data: JSON.stringify(data) } as MessageEvent);
  }
  /** A named server-sent event (`event: <type>`), as the Gillwise server sends them. */
  emitNamed(type: string, data: unknown) {
    for (const l of this.named.get(type) ?? []) l({ data: JSON.stringify(data) } as MessageEvent);
  }
  close() {
    this.closed = true;
  }
}

describe('live events', () => {
  it('invalidates the registered key prefixes of each event type', async () => {
    const offA = registerLiveEvent('reading.stored', (e) => [farmKey(e.farmId, 'units', 'detail', e.unitId)]);
    const offB = registerLiveEvent('reading.stored', [['dashboard']]);
    const queryClient = new QueryClient();
    const spy = vi.spyOn(queryClient, 'invalidateQueries');
    let source: FakeEventSource | undefined;
    const close = connectLiveEvents({
      farmId: 'f1',
      queryClient,
      createEventSource: (url) => (source = new FakeEventSource(url)) as unknown as EventSource,
    });
    expect(source?.url).toBe('/api/farms/f1/events');

    source?.emit({ type: 'reading.stored', farmId: 'f1', unitId: 'u7' });
    expect(spy.mock.calls.map((c) => c[0]?.queryKey)).toEqual([['farm', 'f1', 'units', 'detail', 'u7'], ['dashboard']]);

    spy.mockClear();
    source?.emit({ type: 'reading.stored', farmId: 'other', unitId: 'u7' });
    source?.emit({ type: 'nobody.listens', farmId: 'f1' });
    source?.onmessage?.({ data: 'not json' } as MessageEvent);
    expect(spy).not.toHaveBeenCalled();

    offA();
    expect(keysForEvent({ type: 'reading.stored', farmId: 'f1' })).toEqual([['dashboard']]);
    offB();
    close();
    expect(source?.closed).toBe(true);
  });

  it("handles the server's named events (event: status)", () => {
    const off = registerLiveEvent('status', (e) => [farmKey(e.farmId, 'status')]);
    const queryClient = new QueryClient();
    const spy = vi.spyOn(queryClient, 'invalidateQueries');
    let source: FakeEventSource | undefined;
    const close = connectLiveEvents({ farmId: 'f1', queryClient, createEventSource: (url) => (source = new FakeEventSource(url)) as unknown as EventSource });
    source?.emitNamed('status', { type: 'status', farmId: 'f1', unitId: null, at: new Date().toISOString() });
    expect(spy.mock.calls.map((c) => c[0]?.queryKey)).toEqual([['farm', 'f1', 'status']]);
    off();
    close();
  });

  it('refreshes everything of the farm after the stream reconnects', () => {
    const queryClient = new QueryClient();
    const spy = vi.spyOn(queryClient, 'invalidateQueries');
    let source: FakeEventSource | undefined;
    connectLiveEvents({ farmId: 'f1', queryClient, createEventSource: (url) => (source = new FakeEventSource(url)) as unknown as EventSource });
    source?.onopen?.();
    expect(spy).not.toHaveBeenCalled();
    source?.onerror?.();
    source?.onopen?.();
    expect(spy).toHaveBeenCalledWith({ queryKey: ['farm', 'f1'] });
  });
});
