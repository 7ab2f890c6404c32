import { describe, expect, it } from 'vitest';
import type { ProbeReadingsPayload, ReadingSample } from '../../shared/schemas/mqtt.schema';
import { buildReadingsPayload } from './payload';
import { SampleQueue } from './sample-queue';

const telemetry = { batteryPct: 80, rssiDbm: -70 };
const sample = (i: number): ReadingSample => ({
  at: new Date(Date.UTC(2025, 6, 1) + i * 60_000).toISOString(),
  values: [{ quantity: 'ph', value: 7 + (i % 100) / 100, unit: 'pH' }],
});
const makePayload = (samples: readonly ReadingSample[]) => buildReadingsPayload(samples, telemetry, Date.UTC(2025, 6, 2));

/** A publisher that fails its first `failures` calls, then records every payload it accepts. */
function flakyPublisher(failures: number) {
  let calls = 0;
  const accepted: ProbeReadingsPayload[] = [];
  return {
    accepted,
    get calls() {
      return calls;
    },
    publish: async (payload: ProbeReadingsPayload) => {
      calls += 1;
      await Promise.resolve();
      if (calls <= failures) throw new Error(`broker unavailable (${calls})`);
      accepted.push(structuredClone(payload));
    },
  };
}

describe('sample queue', () => {
  it('keeps every sample while the publisher fails and sends each exactly once after it succeeds', async () => {
    const publisher = flakyPublisher(3);
    const queue = new SampleQueue({ publish: publisher.publish, makePayload });
    const samples = Array.from({ length: 450 }, (_, i) => sample(i));
    queue.push(...samples);

    for (let attempt = 1; attempt <= 3; attempt += 1) {
      const result = await queue.flush();
      expect(result.error).toBeInstanceOf(Error);
      expect(result.sentSamples).toBe(0);
      expect(queue.size).toBe(450);
    }
    const result = await queue.flush();
    expect(result.error).toBeUndefined();
    expect(result.sentSamples).toBe(450);
    expect(queue.size).toBe(0);

    const sent = publisher.accepted.flatMap((p) => p.samples);
    expect(sent).toEqual(samples); // each once, in order
    expect(publisher.accepted.map((p) => p.samples.length)).toEqual([200, 200, 50]);
  });

  it('a failure midway keeps only the unacknowledged samples and resumes from them', async () => {
    let calls = 0;
    const accepted: ReadingSample[][] = [];
    const queue = new SampleQueue({
      makePayload,
      publish: async (payload) => {
        calls += 1;
        if (calls === 2) throw new Error('connection closed');
        accepted.push(payload.samples);
      },
    });
    const samples = Array.from({ length: 500 }, (_, i) => sample(i));
    queue.push(...samples);
    const first = await queue.flush();
    expect(first.sentSamples).toBe(200);
    expect(queue.size).toBe(300);
    await queue.flush();
    expect(accepted.flat()).toEqual(samples);
  });

  it('samples pushed while a message is in flight go in a later message, not lost or doubled', async () => {
    let release: () => void = () => undefined;
    const accepted: ReadingSample[][] = [];
    const queue = new SampleQueue({
      makePayload,
      publish: (payload) =>
        new Promise<void>((resolve) => {
          release = () => {
            accepted.push(payload.samples);
            resolve();
          };
        }),
    });
    queue.push(sample(0));
    const flushing = queue.flush();
    await Promise.resolve();
    queue.push(sample(1), sample(2));
    expect(queue.flush()).toBe(flushing); // concurrent flushes share one run
    release();
    await new Promise((r) => setTimeout(r, 0));
    release();
    await flushing;
    expect(accepted).toEqual([[sample(0)], [sample(1), sample(2)]]);
  });

  it('when full, drops the oldest unsent samples and says how many', async () => {
    const drops: number[] = [];
    const queue = new SampleQueue({ makePayload, publish: async () => undefined, capacity: 100, onDrop: (n) => drops.push(n) });
    queue.push(...Array.from({ length: 130 }, (_, i) => sample(i)));
    expect(queue.size).toBe(100);
    expect(drops).toEqual([30]);
    expect(queue.droppedTotal).toBe(30);
  });

  it('splits a chunk that would exceed the payload size limit', async () => {
    const sizes: number[] = [];
    const queue = new SampleQueue({
      makePayload,
      maxPayloadBytes: 2000,
      publish: async (payload) => {
        sizes.push(JSON.stringify(payload).length);
      },
    });
    queue.push(...Array.from({ length: 100 }, (_, i) => sample(i)));
    await queue.flush();
    expect(queue.size).toBe(0);
    for (const size of sizes) expect(size).toBeLessThanOrEqual(2000);
  });
});
