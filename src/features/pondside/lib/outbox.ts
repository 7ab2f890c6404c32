import { apiErrorSchema, CLIENT_HEADER } from '@shared/schemas/auth.schema';
import { createStore, del, set, values, type UseStore } from 'idb-keyval';
import { apiUrl } from '@/lib/api-client';

/**
 * The device outbox: every entry a hand makes at the pondside (kit results, night-round readings,
 * observations) is written to IndexedDB with its client id BEFORE it is sent, then sent when there is
 * a connection. An entry leaves the outbox only when the server answers 200 or 201 (stored now, or
 * stored before under the same client id). A validation refusal keeps it, with the server's words,
 * for the hand to fix or discard; a 401 keeps everything until someone signs in again.
 */

export type OutboxKind = 'water-test' | 'observation';
export type OutboxState = 'waiting' | 'rejected' | 'signed-out';

export interface OutboxError {
  status: number;
  code: string;
  message: string;
  fieldErrors: Record<string, string[]>;
}

/** A photo kept with the entry (bytes, so every browser's IndexedDB can hold it). */
export interface OutboxPhoto {
  bytes: ArrayBuffer;
  type: string;
  name: string;
}

export interface OutboxEntry {
  /** The client id the server stores the entry under (a resend stores once). */
  id: string;
  farmId: string;
  unitId: string;
  /** Who made it: only their session sends it. */
  userId: string;
  kind: OutboxKind;
  /** API path the body is POSTed to. */
  path: string;
  body: Record<string, unknown>;
  /** Attached after the server has stored the entry (POST <path>/<id>/photo). */
  photo?: OutboxPhoto | null;
  /** What the "waiting to send" list shows. */
  unitCode: string;
  unitName: string;
  createdAt: string;
  attempts: number;
  state: OutboxState;
  error: OutboxError | null;
  lastTriedAt: string | null;
}

export type NewOutboxEntry = Pick<
  OutboxEntry,
  'id' | 'farmId' | 'unitId' | 'userId' | 'kind' | 'path' | 'body' | 'unitCode' | 'unitName'
> & {
  photo?: OutboxPhoto | null;
};

export interface OutboxSendResult {
  status: number;
  body: unknown;
}
export type OutboxSender = (entry: OutboxEntry) => Promise<OutboxSendResult>;
export type PhotoSender = (path: string, photo: OutboxPhoto) => Promise<OutboxSendResult>;

export interface SentRecord {
  entry: OutboxEntry;
  status: number;
  body: unknown;
  at: number;
  /** What became of the entry's photo: none, attached, or refused by the server (too big, not an image). */
  photo: 'none' | 'attached' | 'refused';
}

/** POST the entry with the app's usual headers; a network failure is status 0. */
export const fetchSender: OutboxSender = async (entry) => {
  let response: Response;
  try {
    response = await fetch(apiUrl(entry.path), {
      method: 'POST',
      credentials: 'same-origin',
      headers: { accept: 'application/json', 'content-type': 'application/json', [CLIENT_HEADER]: 'web' },
      body: JSON.stringify(entry.body),
    });
  } catch {
    return { status: 0, body: null };
  }
  let body: unknown = null;
  try {
    const text = await response.text();
    body = text ? (JSON.parse(text) as unknown) : null;
  } catch {
    body = null;
  }
  return { status: response.status, body };
};

/** POST the photo as multipart form data (field "photo"); the browser sets the boundary. */
export const fetchPhotoSender: PhotoSender = async (path, photo) => {
  const form = new FormData();
  form.append('photo', new Blob([photo.bytes], { type: photo.type }), photo.name);
  try {
    const response = await fetch(apiUrl(path), {
      method: 'POST',
      credentials: 'same-origin',
      headers: { accept: 'application/json', [CLIENT_HEADER]: 'web' },
      body: form,
    });
    return { status: response.status, body: null };
  } catch {
    return { status: 0, body: null };
  }
};

function errorFrom(result: OutboxSendResult): OutboxError {
  const parsed = apiErrorSchema.safeParse(result.body);
  if (!parsed.success) return { status: result.status, code: `http_${result.status}`, message: '', fieldErrors: {} };
  const { code, message, details } = parsed.data.error;
  const fieldErrors: Record<string, string[]> = {};
  if (details && typeof details === 'object' && 'fieldErrors' in details) {
    const fe = (details as { fieldErrors: unknown }).fieldErrors;
    if (fe && typeof fe === 'object') {
      for (const [field, list] of Object.entries(fe as Record<string, unknown>)) {
        if (Array.isArray(list)) fieldErrors[field] = list.filter((m): m is string => typeof m === 'string');
      }
    }
  }
  return { status: result.status, code, message, fieldErrors };
}

/** Worth asking again later: no answer, the server busy or broken, a timeout or a rate limit. */
function isRetryable(status: number): boolean {
  return status === 0 || status === 408 || status === 429 || status >= 500 || (status >= 200 && status < 300);
}

/** 1 s, 2 s, 4 s … capped at a minute, with ±20 % jitter so a farm's phones don't all retry together. */
export function retryDelayMs(attempt: number, random: () => number = Math.random): number {
  const base = Math.min(60_000, 1000 * 2 ** Math.max(0, attempt - 1));
  return Math.round(base * (0.8 + 0.4 * random()));
}

export interface OutboxOptions {
  store?: UseStore;
  send?: OutboxSender;
  sendPhoto?: PhotoSender;
  isOnline?: () => boolean;
  delay?: (attempt: number) => number;
}

export class Outbox {
  private readonly entries = new Map<string, OutboxEntry>();
  private readonly listeners = new Set<() => void>();
  private readonly sentListeners = new Set<(record: SentRecord) => void>();
  private readonly sent = new Map<string, SentRecord>();
  private snapshot: readonly OutboxEntry[] = [];
  private loading: Promise<void> | null = null;
  private flushing: Promise<void> | null = null;
  private again = false;
  private timer: ReturnType<typeof setTimeout> | null = null;
  private activeUserId: string | null = null;
  private storeFn: UseStore | null;
  /** False when this browser gives us no IndexedDB (entries then live only until the page closes). */
  persistent = true;
  private readonly send: OutboxSender;
  private readonly sendPhoto: PhotoSender;
  private readonly isOnline: () => boolean;
  private readonly delay: (attempt: number) => number;

  constructor(options: OutboxOptions = {}) {
    this.storeFn = options.store ?? null;
    this.send = options.send ?? fetchSender;
    this.sendPhoto = options.sendPhoto ?? fetchPhotoSender;
    this.isOnline = options.isOnline ?? (() => globalThis.navigator?.onLine !== false);
    this.delay = options.delay ?? ((attempt) => retryDelayMs(attempt));
  }

  private store(): UseStore | null {
    if (!this.storeFn) {
      if (typeof indexedDB === 'undefined') {
        this.persistent = false;
        return null;
      }
      this.storeFn = createStore('gillwise-outbox', 'entries');
    }
    return this.storeFn;
  }

  private async persist(entry: OutboxEntry): Promise<void> {
    const store = this.store();
    if (!store) return;
    try {
      await set(entry.id, entry, store);
    } catch {
      this.persistent = false;
    }
  }

  private async forget(id: string): Promise<void> {
    const store = this.store();
    if (!store) return;
    try {
      await del(id, store);
    } catch {
      /* it will be resent and stored once by its client id */
    }
  }

  /** Read what an earlier visit left in IndexedDB (once). */
  load(): Promise<void> {
    if (!this.loading) {
      this.loading = (async () => {
        const store = this.store();
        if (!store) return;
        try {
          for (const value of await values<OutboxEntry>(store)) {
            if (value && typeof value.id === 'string' && !this.entries.has(value.id)) this.entries.set(value.id, value);
          }
        } catch {
          this.persistent = false;
        }
        this.emit();
      })();
    }
    return this.loading;
  }

  list(): readonly OutboxEntry[] {
    return this.snapshot;
  }

  subscribe = (listener: () => void): (() => void) => {
    this.listeners.add(listener);
    return () => this.listeners.delete(listener);
  };

  getSnapshot = (): readonly OutboxEntry[] => this.snapshot;

  /** Called with the server's answer each time an entry is stored. */
  onSent(listener: (record: SentRecord) => void): () => void {
    this.sentListeners.add(listener);
    return () => this.sentListeners.delete(listener);
  }

  /** The server's answer for an entry sent during this visit. */
  sentFor(id: string): SentRecord | undefined {
    return this.sent.get(id);
  }

  private emit() {
    this.snapshot = [...this.entries.values()].sort((a, b) => a.createdAt.localeCompare(b.createdAt) || a.id.localeCompare(b.id));
    for (const l of this.listeners) l();
  }

  /** Only this user's entries are sent (a shared phone keeps the others until their owner signs in). */
  setActiveUser(userId: string | null): void {
    const changed = userId !== this.activeUserId;
    this.activeUserId = userId;
    if (changed && userId) void this.flush();
  }

  /** Store first, then try to send. Resolves once the entry is safe on the device. */
  async add(input: NewOutboxEntry): Promise<OutboxEntry> {
    await this.load();
    const entry: OutboxEntry = {
      ...input,
      createdAt: new Date().toISOString(),
      attempts: 0,
      state: 'waiting',
      error: null,
      lastTriedAt: null,
    };
    await this.persist(entry);
    this.entries.set(entry.id, entry);
    this.emit();
    void this.flush();
    return entry;
  }

  /** A corrected body for a refused entry (same client id), sent again. */
  async replace(id: string, body: Record<string, unknown>): Promise<void> {
    const current = this.entries.get(id);
    if (!current) return;
    const next: OutboxEntry = { ...current, body, state: 'waiting', error: null, attempts: 0 };
    await this.persist(next);
    this.entries.set(id, next);
    this.emit();
    void this.flush();
  }

  /** The hand chose to throw a refused entry away. */
  async discard(id: string): Promise<void> {
    await this.forget(id);
    this.entries.delete(id);
    this.emit();
  }

  private async save(entry: OutboxEntry): Promise<void> {
    this.entries.set(entry.id, entry);
    await this.persist(entry);
  }

  /** Send everything that can be sent now. Calls while a round is running join it (and run one more round). */
  flush(): Promise<void> {
    if (this.flushing) {
      this.again = true;
      return this.flushing;
    }
    this.flushing = (async () => {
      try {
        do {
          this.again = false;
          await this.round();
        } while (this.again);
      } finally {
        this.flushing = null;
      }
    })();
    return this.flushing;
  }

  private async round(): Promise<void> {
    await this.load();
    if (this.timer) {
      clearTimeout(this.timer);
      this.timer = null;
    }
    if (!this.isOnline() || !this.activeUserId) return;
    const due = [...this.snapshot].filter((e) => e.state !== 'rejected' && e.userId === this.activeUserId);
    for (const queued of due) {
      const entry = this.entries.get(queued.id);
      if (!entry || entry.state === 'rejected') continue;
      const tried = { ...entry, attempts: entry.attempts + 1, lastTriedAt: new Date().toISOString() };
      const result = await this.send(tried);
      if (result.status === 200 || result.status === 201) {
        let photo: SentRecord['photo'] = 'none';
        const storedId = (result.body as { id?: unknown } | null)?.id;
        if (entry.photo && typeof storedId === 'string') {
          const p = await this.sendPhoto(`${entry.path}/${encodeURIComponent(storedId)}/photo`, entry.photo);
          if (p.status === 200 || p.status === 201) photo = 'attached';
          else if (isRetryable(p.status) || p.status === 401) {
            // The entry is stored; keep it (with its photo) and try again — the resend is answered 200.
            await this.save({ ...tried, state: 'waiting', error: null });
            this.emit();
            this.schedule(tried.attempts);
            return;
          } else photo = 'refused';
        }
        await this.forget(entry.id);
        this.entries.delete(entry.id);
        const record: SentRecord = { entry: tried, status: result.status, body: result.body, at: Date.now(), photo };
        this.sent.set(entry.id, record);
        this.emit();
        for (const l of this.sentListeners) l(record);
        continue;
      }
      if (result.status === 401) {
        // Session gone: keep every entry and wait for a sign-in (setActiveUser flushes again).
        for (const e of this.entries.values()) if (e.state !== 'rejected') await this.save({ ...e, state: 'signed-out' });
        this.activeUserId = null;
        this.emit();
        return;
      }
      if (isRetryable(result.status)) {
        await this.save({ ...tried, state: 'waiting', error: result.status === 0 ? null : errorFrom(result) });
        this.emit();
        this.schedule(tried.attempts);
        return;
      }
      await this.save({ ...tried, state: 'rejected', error: errorFrom(result) });
      this.emit();
    }
  }

  private schedule(attempt: number) {
    if (this.timer) clearTimeout(this.timer);
    this.timer = setTimeout(() => {
      this.timer = null;
      void this.flush();
    }, this.delay(attempt));
  }

  private started = false;

  /** Listen for the connection coming back and for the app coming to the front. Safe to call often. */
  start(): void {
    if (this.started || typeof window === 'undefined') return;
    this.started = true;
    window.addEventListener('online', () => void this.flush());
    document.addEventListener('visibilitychange', () => {
      if (document.visibilityState === 'visible') void this.flush();
    });
    void this.load().then(() => this.flush());
  }

  /** Tests: forget timers and in-memory state. */
  reset(): void {
    if (this.timer) clearTimeout(this.timer);
    this.timer = null;
    this.entries.clear();
    this.sent.clear();
    this.loading = null;
    this.activeUserId = null;
    this.emit();
  }
}

/** The one outbox of this browser. */
export const outbox = new Outbox();
