import { randomUUID } from 'node:crypto';
import type { Redis } from 'ioredis';
import type { ImportMapping, ImportReject, ImportState, ImportWarning } from '../../../shared/schemas/imports.schema';

// Import sessions live in Redis, one hash per import plus a list of rejected rows, for 24 hours after
// their last change; the uploaded file itself sits on disk under DATA_DIR/uploads (docs/imports.md).

export const SESSION_TTL_SECONDS = 24 * 3600;
const LOCK_TTL_MS = 60_000;

export type CommitReport = {
  skipRejected: boolean;
  storedRows: number;
  alreadyStoredRows: number;
  skippedRows: number;
  queuedResults: number;
  startedAt: string;
  finishedAt: string | null;
};

export type ImportSession = {
  importId: string;
  farmId: string;
  createdById: string | null;
  fileName: string;
  sizeBytes: number;
  sha256: string;
  delimiter: ',' | ';' | '\t' | '|';
  headers: string[];
  warnings: ImportWarning[];
  totalRows: number;
  state: ImportState;
  processedRows: number;
  acceptedRows: number;
  rejectedRows: number;
  mapping: ImportMapping | null;
  /** Key of the mapping the counts above belong to. */
  mappingKey: string | null;
  commit: CommitReport | null;
  error: { code: string; message: string } | null;
  createdAt: string;
  updatedAt: string;
};

const RELEASE = `if redis.call('get', KEYS[1]) == ARGV[1] then return redis.call('del', KEYS[1]) else return 0 end`;
const REFRESH = `if redis.call('get', KEYS[1]) == ARGV[1] then return redis.call('pexpire', KEYS[1], ARGV[2]) else return 0 end`;

export type SessionLock = { refresh(): Promise<boolean>; release(): Promise<void> };

export class ImportSessionStore {
  constructor(
    private readonly redis: Redis,
    private readonly prefix: string,
  ) {}

  private key(farmId: string, importId: string, part = ''): string {
    return `${this.prefix}:imports:${farmId}:${importId}${part}`;
  }

  async get(farmId: string, importId: string): Promise<ImportSession | null> {
    const raw = await this.redis.hgetall(this.key(farmId, importId));
    if (!raw.importId) return null;
    const out: Record<string, unknown> = {};
    for (const [k, v] of Object.entries(raw)) out[k] = JSON.parse(v) as unknown;
    return out as ImportSession;
  }

  async create(session: ImportSession): Promise<void> {
    await this.write(session.farmId, session.importId, session, true);
  }

  /** Writes the given fields (and updatedAt), refreshing the 24 h expiry of every key of the import. */
  async update(farmId: string, importId: string, patch: Partial<ImportSession>): Promise<void> {
    await this.write(farmId, importId, { ...patch, updatedAt: new Date().toISOString() }, false);
  }

  private async write(farmId: string, importId: string, fields: Partial<ImportSession>, replace: boolean): Promise<void> {
    const key = this.key(farmId, importId);
    const flat: Record<string, string> = {};
    for (const [k, v] of Object.entries(fields)) if (v !== undefined) flat[k] = JSON.stringify(v);
    const multi = this.redis.multi();
    if (replace) multi.del(key, this.key(farmId, importId, ':rejects'));
    multi.hset(key, flat);
    multi.expire(key, SESSION_TTL_SECONDS);
    multi.expire(this.key(farmId, importId, ':rejects'), SESSION_TTL_SECONDS);
    await multi.exec();
  }

  async touch(farmId: string, importId: string): Promise<void> {
    await this.update(farmId, importId, {});
  }

  async clearRejects(farmId: string, importId: string): Promise<void> {
    await this.redis.del(this.key(farmId, importId, ':rejects'));
  }

  async appendRejects(farmId: string, importId: string, rejects: ImportReject[]): Promise<void> {
    if (!rejects.length) return;
    const key = this.key(farmId, importId, ':rejects');
    await this.redis.multi().rpush(key, ...rejects.map((r) => JSON.stringify(r))).expire(key, SESSION_TTL_SECONDS).exec();
  }

  async rejects(farmId: string, importId: string, offset: number, limit: number): Promise<{ items: ImportReject[]; total: number }> {
    const key = this.key(farmId, importId, ':rejects');
    const [items, total] = await Promise.all([this.redis.lrange(key, offset, offset + limit - 1), this.redis.llen(key)]);
    return { items: items.map((s) => JSON.parse(s) as ImportReject), total };
  }

  /** Ids of tests written by a running commit, kept outside process memory until their jobs are queued. */
  async pushWritten(farmId: string, importId: string, entries: string[]): Promise<void> {
    if (!entries.length) return;
    const key = this.key(farmId, importId, ':written');
    await this.redis.multi().rpush(key, ...entries).expire(key, SESSION_TTL_SECONDS).exec();
  }

  async takeWritten(farmId: string, importId: string, count: number): Promise<string[]> {
    const key = this.key(farmId, importId, ':written');
    const [items] = (await this.redis.multi().lrange(key, 0, count - 1).ltrim(key, count, -1).exec()) ?? [];
    return (items?.[1] as string[] | undefined) ?? [];
  }

  async clearWritten(farmId: string, importId: string): Promise<void> {
    await this.redis.del(this.key(farmId, importId, ':written'));
  }

  /** One validation or commit at a time per import; the lock expires if its process dies. */
  async lock(farmId: string, importId: string): Promise<SessionLock | null> {
    const key = this.key(farmId, importId, ':lock');
    const token = randomUUID();
    const ok = await this.redis.set(key, token, 'PX', LOCK_TTL_MS, 'NX');
    if (ok !== 'OK') return null;
    return {
      refresh: async () => Number(await this.redis.eval(REFRESH, 1, key, token, String(LOCK_TTL_MS))) === 1,
      release: async () => {
        await this.redis.eval(RELEASE, 1, key, token);
      },
    };
  }

  async isLocked(farmId: string, importId: string): Promise<boolean> {
    return (await this.redis.exists(this.key(farmId, importId, ':lock'))) === 1;
  }
}
