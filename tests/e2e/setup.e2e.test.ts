// A manager sets up a new pond in a real browser: draws its outline on the map, adds a probe to it and
// sees the probe's secret once — and the secret really works: an MQTT client signs in with it and the
// broker stores what it sends.
import mqtt from 'mqtt';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import en from '../../src/locales/en.json';
import { unitListResponseSchema } from '../../shared/schemas/units.schema';
import { demoEmail, seedDemoFarms } from '../factories/demo';
import { signedIn } from '../factories/session';
import { startTestApp, type TestApp } from '../setup/test-app';
import { launchBrowser, signIn, viewports, watch, type TestBrowser } from './browser';

describe('setup in a real browser', () => {
  let app: TestApp;
  let baseUrl: string;
  let farmId: string;
  let browser: TestBrowser;

  beforeAll(async () => {
    app = await startTestApp({ broker: true, serveClient: true, worker: true });
    const seed = await seedDemoFarms(app.ds);
    farmId = seed.farms['harrow-bend']!;
    if (!app.baseUrl || !app.broker) throw new Error('no base URL or broker');
    baseUrl = app.baseUrl;
    browser = await launchBrowser();
  });

  afterAll(async () => {
    await browser?.close();
    await app?.close();
  });

  it('a manager draws a new pond, adds a probe, sees its secret once, and the secret connects to the broker', async () => {
    const page = await browser.newPage(viewports.desktop);
    const seen = watch(page);
    await signIn(page, baseUrl, 'manager');
    await page.goto(`${baseUrl}/farms/${farmId}/setup`, { waitUntil: 'load' });
    const editor = page.getByTestId('outline-editor');
    await page.locator('[data-testid="outline-editor"][data-ready="true"]').waitFor();

    // Draw: four clicks in the lower right of the map, then drag the third corner outwards.
    await page.getByRole('button', { name: en.setup.map.drawNew }).click();
    // The whole map in view (below the sticky header).
    await editor.evaluate((e) => e.scrollIntoView({ block: 'end' }));
    const box = (await editor.boundingBox())!;
    const at = (fx: number, fy: number) => ({ x: box.x + box.width * fx, y: box.y + box.height * fy });
    const corners = [at(0.62, 0.8), at(0.8, 0.8), at(0.8, 0.93), at(0.62, 0.93)];
    for (const c of corners) {
      await page.mouse.click(c.x, c.y);
      await page.waitForTimeout(120);
    }
    await expect.poll(() => editor.getAttribute('data-corners')).toBe('4');
    await page.getByRole('button', { name: en.setup.map.finish }).click();
    const tools = page.getByTestId('draw-tools');
    const areaBefore = await tools.textContent();
    await editor.evaluate((e) => e.scrollIntoView({ block: 'end' }));
    const box2 = (await editor.boundingBox())!;
    const third = { x: box2.x + box2.width * 0.8, y: box2.y + box2.height * 0.93 };
    await page.mouse.move(third.x, third.y);
    await page.mouse.down();
    await page.mouse.move(third.x + 40, third.y + 20, { steps: 6 });
    await page.mouse.up();
    await expect.poll(() => tools.textContent()).not.toBe(areaBefore);
    expect(await editor.getAttribute('data-corners')).toBe('4');

    const form = page.getByTestId('unit-form');
    await form.getByLabel(en.setup.unit.code, { exact: true }).fill('P7');
    await form.getByLabel(en.setup.unit.name, { exact: true }).fill('Pond 7 — East Field');
    await form.getByLabel(en.setup.unit.state).selectOption('cycling');
    await form.getByLabel(en.setup.unit.volume).fill('12000');
    await form.getByLabel(en.setup.unit.species).fill('channel_catfish');
    await form.getByRole('button', { name: en.setup.unit.create }).click();
    await page.getByText('P7 is saved.').waitFor();

    const manager = await signedIn(app.app, demoEmail('manager'));
    const units = unitListResponseSchema.parse((await manager.get(`/api/farms/${farmId}/units`)).body).units;
    const p7 = units.find((u) => u.code === 'P7')!;
    expect(p7).toBeTruthy();
    expect(p7.kind).toBe('pond');
    expect(p7.state).toBe('cycling');
    expect(p7.volumeM3).toBe(12000);
    const ring = p7.outline!.coordinates[0]!;
    expect(ring).toHaveLength(5);
    expect(ring[0]).toEqual(ring[4]);
    expect(p7.areaM2).toBeGreaterThan(0);

    // A probe in the new pond: the secret is shown once.
    await page.getByRole('tab', { name: en.setup.tab.probes }).click();
    await page.getByRole('button', { name: en.setup.probe.add }).click();
    const probeForm = page.getByTestId('probe-form');
    await probeForm.getByLabel(en.setup.probe.label, { exact: true }).fill('P7 sonde');
    await probeForm.getByLabel(en.setup.probe.unit).selectOption({ label: 'P7 — Pond 7 — East Field' });
    await probeForm.getByRole('button', { name: en.setup.probe.create }).click();
    const secretBox = page.getByTestId('probe-secret');
    await secretBox.waitFor();
    expect(await secretBox.textContent()).toContain(en.setup.secret.onceTitle);
    const username = (await page.getByTestId('secret-username').textContent())!;
    const secret = (await page.getByTestId('secret-value').textContent())!;
    const topic = (await page.getByTestId('secret-topic').textContent())!;
    expect(secret.length).toBeGreaterThan(16);
    expect(topic).toContain(username);

    // The credential works: connect, publish a reading, and the broker stores it.
    const url = `mqtt://127.0.0.1:${app.broker!.port}`;
    await expect(
      mqtt.connectAsync(url, { protocolVersion: 4, username, password: 'not-the-secret', clientId: username, reconnectPeriod: 0 }),
    ).rejects.toThrow(/Bad username or password/);
    const client = await mqtt.connectAsync(url, { protocolVersion: 4, username, password: secret, clientId: username, reconnectPeriod: 0 });
    const sampleAt = new Date(Date.now() - 60_000).toISOString();
    await client.publishAsync(
      topic,
      JSON.stringify({
        v: 1,
        samples: [
          {
            at: sampleAt,
            values: [
              { quantity: 'water_temperature', value: 24.6, unit: 'C' },
              { quantity: 'ph', value: 7.8, unit: 'pH' },
            ],
          },
        ],
      }),
      { qos: 1 },
    );
    await client.endAsync();
    const probeId = ((await app.ds.query('SELECT id FROM probes WHERE probe_key = $1', [username])) as Array<{ id: string }>)[0]!.id;
    await expect
      .poll(
        async () =>
          Number(
            ((await app.ds.query('SELECT count(*)::int AS n FROM readings WHERE probe_id = $1', [probeId])) as Array<{ n: number }>)[0]!.n,
          ),
        { timeout: 10_000 },
      )
      .toBe(2);

    // Closing the dialog drops the secret: it is nowhere on the page any more.
    await page.getByLabel(en.setup.secret.stored).check();
    await page.getByRole('button', { name: en.setup.secret.done }).click();
    await secretBox.waitFor({ state: 'detached' });
    expect(await page.content()).not.toContain(secret);
    const card = page.locator(`[data-testid="probe-card"][data-probe-key="${username}"]`);
    await card.waitFor();
    expect(await card.textContent()).toContain('P7 — Pond 7 — East Field');

    expect(seen.offLoopback).toEqual([]);
    expect(seen.errors).toEqual([]);
    await page.close();
  });
});
