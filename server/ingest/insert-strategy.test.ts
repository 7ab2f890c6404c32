import { describe, expect, it } from 'vitest';
import type { ReadingRow } from './reading-handler';
import { optimisticInsert } from './insert-strategy';

const row = (n: number): ReadingRow => ({ probeId: 'p', quantity: 'ph', at: new Date(n), value: 7, quality: 'good' });

/** A fake repository holding keys, behaving like the two statements on the readings primary key. */
function fakeRepo() {
  const stored = new Set<number>();
  const calls: string[] = [];
  return {
    stored,
    calls,
    async insertNewBatch(rows: ReadingRow[]) {
      calls.push('plain');
      const keys = rows.map((r) => r.at.getTime());
      if (keys.some((k) => stored.has(k)) || new Set(keys).size !== keys.length) {
        throw Object.assign(new Error('duplicate key value violates unique constraint "pk_readings"'), { code: '23505' });
      }
      keys.forEach((k) => stored.add(k));
      return rows.length;
    },
    async insertBatch(rows: ReadingRow[]) {
      calls.push('on-conflict');
      let n = 0;
      for (const r of rows) {
        if (stored.has(r.at.getTime())) continue;
        stored.add(r.at.getTime());
        n++;
      }
      return n;
    },
  };
}

describe('optimistic insert of reading batches', () => {
  it('writes new readings with the plain insert', async () => {
    const repo = fakeRepo();
    const insert = optimisticInsert(repo);
    expect(await insert([row(1), row(2)])).toBe(2);
    expect(repo.calls).toEqual(['plain']);
  });

  it('writes a batch holding a stored reading again with ON CONFLICT, storing the rest once and counting only new rows', async () => {
    const repo = fakeRepo();
    let t = 0;
    const insert = optimisticInsert(repo, { cooldownMs: 1000, now: () => t });
    await insert([row(1)]);
    expect(await insert([row(1), row(2), row(2)])).toBe(1);
    expect([...repo.stored].sort()).toEqual([1, 2]);
    expect(repo.calls).toEqual(['plain', 'plain', 'on-conflict']);
    // Within the cool-down every batch goes straight to ON CONFLICT; after it, plain again.
    await insert([row(3)]);
    t = 1000;
    await insert([row(4)]);
    expect(repo.calls.slice(3)).toEqual(['on-conflict', 'plain']);
    expect(insert.stats).toEqual({ plain: 2, conflicts: 1, guarded: 2 });
  });

  it('passes any other error on without retrying, so the messages are refused and re-sent', async () => {
    const repo = fakeRepo();
    repo.insertNewBatch = async () => {
      throw Object.assign(new Error('connection refused'), { code: 'ECONNREFUSED' });
    };
    const insert = optimisticInsert(repo);
    await expect(insert([row(1)])).rejects.toThrow('connection refused');
    expect(repo.stored.size).toBe(0);
  });

  it('recognises the unique violation on a TypeORM QueryFailedError (code on driverError)', async () => {
    const repo = fakeRepo();
    repo.insertNewBatch = async () => {
      throw Object.assign(new Error('query failed'), { driverError: { code: '23505' } });
    };
    const insert = optimisticInsert(repo);
    expect(await insert([row(5)])).toBe(1);
  });
});
