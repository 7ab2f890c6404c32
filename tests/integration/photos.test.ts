import { readdirSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestApp, type TestApp } from '../setup/test-app';
import { demoEmail, seedDemoFarms } from '../factories/demo';
import { signedIn } from '../factories/session';
import type { SeedResult } from '../../server/db/seed/seed';

let t: TestApp;
let seed: SeedResult;
let farmId: string;
// A 1×1 PNG (the PNG signature 89 50 4E 47 0D 0A 1A 0A, ISO/IEC 15948).
const PNG = Buffer.from('iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mNk+M9QDwADhgGAWjR9awAAAABJRU5ErkJggg==', 'base64');

beforeAll(async () => {
  t = await startTestApp();
  seed = await seedDemoFarms(t.ds);
  farmId = seed.farms['harrow-bend']!;
});
afterAll(() => t.close());

async function observation(hand: Awaited<ReturnType<typeof signedIn>>, unitId: string) {
  const res = await hand.post(`/api/farms/${farmId}/units/${unitId}/observations`).send({ kind: 'dead_fish', count: 3 });
  return res.body.id as string;
}

describe('photos of observations', () => {
  it('stores a photo under a server-made name and serves it back to the farm', async () => {
    const hand = await signedIn(t.app, demoEmail('hand'));
    const unitId = seed.units['harrow-bend:P2']!;
    const id = await observation(hand, unitId);
    const res = await hand.post(`/api/farms/${farmId}/units/${unitId}/observations/${id}/photo`).set('x-gillwise-client', 'web').attach('photo', PNG, '../../etc/passwd.png');
    expect(res.status).toBe(201);
    expect(res.body.photoUrl).toMatch(new RegExp(`^/api/farms/${farmId}/photos/[0-9a-f-]{36}\\.png$`));
    const files = readdirSync(join(t.config.DATA_DIR, 'photos'));
    expect(files.every((f) => /^[0-9a-f-]{36}\.png$/.test(f))).toBe(true);
    const back = await hand.get(res.body.photoUrl);
    expect(back.status).toBe(200);
    expect(back.headers['content-type']).toBe('image/png');
    expect(Buffer.compare(back.body as Buffer, PNG)).toBe(0);
    const list = await hand.get(`/api/farms/${farmId}/units/${unitId}/observations`);
    expect(list.body.observations.find((o: { id: string }) => o.id === id).photoUrl).toBe(res.body.photoUrl);
  });

  it('refuses a file that is not an image whatever its name says, and one over the size limit', async () => {
    const hand = await signedIn(t.app, demoEmail('hand'));
    const unitId = seed.units['harrow-bend:P2']!;
    const id = await observation(hand, unitId);
    const fake = await hand.post(`/api/farms/${farmId}/units/${unitId}/observations/${id}/photo`).set('x-gillwise-client', 'web').attach('photo', Buffer.from('<script>alert(1)</script>'), 'cute.png');
    expect(fake.status).toBe(415);
    expect(fake.body.error.message).toMatch(/JPEG, PNG or WebP/);
    const huge = Buffer.concat([PNG, Buffer.alloc(9 * 1024 * 1024)]);
    const big = await hand.post(`/api/farms/${farmId}/units/${unitId}/observations/${id}/photo`).set('x-gillwise-client', 'web').attach('photo', huge, 'big.png');
    expect(big.status).toBe(413);
    expect(big.body.error.code).toBe('payload_too_large');
  });

  it("does not serve another farm's photo to a manager of another farm", async () => {
    const hand = await signedIn(t.app, demoEmail('hand'));
    const unitId = seed.units['harrow-bend:P2']!;
    const id = await observation(hand, unitId);
    const res = await hand.post(`/api/farms/${farmId}/units/${unitId}/observations/${id}/photo`).set('x-gillwise-client', 'web').attach('photo', PNG, 'p.png');
    const name = String(res.body.photoUrl).split('/').pop();
    const other = await signedIn(t.app, demoEmail('manager', 'cedarflats'));
    expect((await other.get(res.body.photoUrl)).status).toBe(404);
    expect((await other.get(`/api/farms/${seed.farms['cedar-flats']}/photos/${name}`)).status).toBe(404);
  });
});
