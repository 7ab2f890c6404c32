import 'fake-indexeddb/auto';
import { clear, createStore, values } from 'idb-keyval';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { Outbox, retryDelayMs, type OutboxEntry, type OutboxSendResult } from './outbox';

const user = '33333333-3333-4333-8333-333333333333';
const entry = (id: string) => ({
  id,
  farmId: 'f1',
  unitId: 'u1',
  userId: user,
  kind: 'water-test' as const,
  path: '/api/farms/f1/units/u1/tests',
  body: { clientId: id, analyte: 'total_ammonia', value: 0.5 },
  unitCode: 'P1',
  unitName: 'Pond 1',
});

let dbIndex = 0;
function setup(answers: Array<OutboxSendResult | (() => OutboxSendResult)>, online = { value: true }) {
  const store = createStore(`outbox-test-${++dbIndex}`, 'entries');
  const sent: OutboxEntry[] = [];
  const send = vi.fn(async (e: OutboxEntry) => {
    sent.push(e);
    const a = answers.shift() ?? { status: 201, body: {} };
    return typeof a === 'function' ? a() : a;
  });
  const box = new Outbox({ store, send, isOnline: () => online.value, delay: () => 10 });
  return { box, store, send, sent, online };
}

describe('the device outbox', () => {
  beforeEach(() => {
    vi.useRealTimers();
  });
  afterEach(() => {
    vi.useRealTimers();
  });

  it('writes the entry to IndexedDB before sending it, and removes it only after the server stored it', async () => {
    const { box, store, send } = setup([]);
    let storedWhenSent: unknown[] = [];
    send.mockImplementationOnce(async () => {
      storedWhenSent = await values(store);
      return { status: 201, body: { id: 'server-id' } };
    });
    box.setActiveUser(user);
    await box.add(entry('a'));
    await box.flush();
    expect(storedWhenSent).toHaveLength(1);
    expect(await values(store)).toHaveLength(0);
    expect(box.sentFor('a')?.body).toEqual({ id: 'server-id' });
  });

  it('keeps everything while offline and sends each entry once when the connection returns', async () => {
    const online = { value: false };
    const { box, store, send } = setup([], online);
    box.setActiveUser(user);
    await box.add(entry('a'));
    await box.add(entry('b'));
    await box.flush();
    expect(send).not.toHaveBeenCalled();
    expect((await values<OutboxEntry>(store)).map((e) => e.state)).toEqual(['waiting', 'waiting']);

    online.value = true;
    await box.flush();
    await box.flush();
    expect(send.mock.calls.map(([e]) => e.id).sort()).toEqual(['a', 'b']);
    expect(await values(store)).toHaveLength(0);
  });

  it('treats "already stored" (200) like "stored" (201)', async () => {
    const { box, store } = setup([{ status: 200, body: { id: 'x' } }]);
    box.setActiveUser(user);
    await box.add(entry('a'));
    await box.flush();
    expect(await values(store)).toHaveLength(0);
  });

  it('keeps an entry the server refuses (4xx) with its field errors, and does not send it again by itself', async () => {
    const refusal = {
      status: 400,
      body: { error: { code: 'validation_failed', message: 'Invalid body', details: { fieldErrors: { value: ['too high'] } } } },
    };
    const { box, store, send } = setup([refusal]);
    box.setActiveUser(user);
    await box.add(entry('a'));
    await box.flush();
    await box.flush();
    expect(send).toHaveBeenCalledTimes(1);
    const [kept] = await values<OutboxEntry>(store);
    expect(kept?.state).toBe('rejected');
    expect(kept?.error?.fieldErrors).toEqual({ value: ['too high'] });

    await box.replace('a', { ...entry('a').body, value: 0.4 });
    await box.flush();
    expect(send).toHaveBeenCalledTimes(2);
    expect(send.mock.calls[1]?.[0].id).toBe('a');
    expect(await values(store)).toHaveLength(0);
  });

  it('on a 401 keeps the queue and sends once someone signs in again', async () => {
    const { box, store, send } = setup([{ status: 401, body: { error: { code: 'unauthenticated', message: 'Sign in' } } }]);
    box.setActiveUser(user);
    await box.add(entry('a'));
    await box.flush();
    expect((await values<OutboxEntry>(store))[0]?.state).toBe('signed-out');

    box.setActiveUser(user);
    await box.flush();
    expect(send).toHaveBeenCalledTimes(2);
    expect(await values(store)).toHaveLength(0);
  });

  it('retries by itself after a network failure or a 5xx', async () => {
    const { box, store, send } = setup([
      { status: 0, body: null },
      { status: 503, body: null },
    ]);
    box.setActiveUser(user);
    await box.add(entry('a'));
    await vi.waitFor(async () => expect(await values(store)).toHaveLength(0), { timeout: 2000 });
    expect(send).toHaveBeenCalledTimes(3);
  });

  it('sends only the signed-in user’s entries (a shared phone keeps the others)', async () => {
    const { box, send } = setup([]);
    box.setActiveUser('someone-else');
    await box.add(entry('a'));
    await box.flush();
    expect(send).not.toHaveBeenCalled();
  });

  it('comes back after a reload: a new outbox on the same database finds the entries', async () => {
    const online = { value: false };
    const { box, store } = setup([], online);
    box.setActiveUser(user);
    await box.add(entry('a'));
    const send = vi.fn(async () => ({ status: 201, body: {} }));
    const again = new Outbox({ store, send, isOnline: () => true });
    await again.load();
    expect(again.list().map((e) => e.id)).toEqual(['a']);
    again.setActiveUser(user);
    await again.flush();
    expect(send).toHaveBeenCalledTimes(1);
    await clear(store);
  });

  it('backs off 1 s, 2 s, 4 s … up to a minute', () => {
    const mid = () => 0.5;
    expect([1, 2, 3, 4, 10].map((a) => retryDelayMs(a, mid))).toEqual([1000, 2000, 4000, 8000, 60000]);
  });
});
