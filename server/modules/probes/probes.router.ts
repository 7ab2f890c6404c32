import { randomUUID } from 'node:crypto';
import { z } from 'zod';
import {
  calibrationListResponseSchema,
  calibrationSchema,
  createCalibrationRequestSchema,
  createMaintenanceWindowRequestSchema,
  createProbeRequestSchema,
  ingestStatusResponseSchema,
  maintenanceWindowListResponseSchema,
  maintenanceWindowSchema,
  probeCredentialResponseSchema,
  probeListQuerySchema,
  probeListResponseSchema,
  probeSchema,
  updateProbeRequestSchema,
} from '../../../shared/schemas/probes.schema';
import { ANY_FARM_ROLE, defineRoute, farmParams, farmRoles, type RouteDef } from '../../http/route-registry';
import type { ProbeConnections, ProbesService } from './probes.service';

export const probeParams = farmParams.extend({ probeId: z.uuid() });
const windowParams = probeParams.extend({ windowId: z.uuid() });
// A secret must not linger in caches or proxies.
const noStore = { 'Cache-Control': 'no-store' };

export function probesRoutes(probes: ProbesService, broker?: ProbeConnections): RouteDef[] {
  return [
    defineRoute({
      method: 'get',
      path: '/api/farms/:farmId/probes',
      summary:
        'Probes of the farm with their health: last seen, battery, signal, reject counts and findings (silent, maintenance, flatline, spike, drift, calibration due).',
      tags: ['probes'],
      access: farmRoles(...ANY_FARM_ROLE),
      params: farmParams,
      query: probeListQuerySchema,
      response: probeListResponseSchema,
      example: (f) => ({ params: { farmId: f.farmId! } }),
      handler: async ({ params, query }) => ({ body: { probes: await probes.list(params.farmId, query) } }),
    }),
    defineRoute({
      method: 'post',
      path: '/api/farms/:farmId/probes',
      summary: 'Register a probe: generates its key (MQTT username) and secret. The secret is in this answer only. Audited.',
      tags: ['probes'],
      access: farmRoles('manager', 'admin'),
      params: farmParams,
      body: createProbeRequestSchema,
      response: probeCredentialResponseSchema,
      example: (f) => ({
        params: { farmId: f.farmId! },
        body: { label: 'Example sonde', unitId: f.unitId!, quantities: ['ph', 'water_temperature'], intervalSeconds: 60 },
      }),
      handler: async ({ params, body, user }) => ({
        status: 201,
        headers: noStore,
        body: await probes.create(params.farmId, body, user?.id ?? null),
      }),
    }),
    defineRoute({
      method: 'get',
      path: '/api/farms/:farmId/probes/:probeId',
      summary: 'One probe with its health.',
      tags: ['probes'],
      access: farmRoles(...ANY_FARM_ROLE),
      params: probeParams,
      response: probeSchema,
      example: (f) => ({ params: { farmId: f.farmId!, probeId: f.probeId! } }),
      handler: async ({ params }) => ({ body: await probes.get(params.farmId, params.probeId) }),
    }),
    defineRoute({
      method: 'patch',
      path: '/api/farms/:farmId/probes/:probeId',
      summary: 'Change label, unit, quantities, interval, model or active. Moving or (de)activating closes its MQTT connection. Audited.',
      tags: ['probes'],
      access: farmRoles('manager', 'admin'),
      params: probeParams,
      body: updateProbeRequestSchema,
      response: probeSchema,
      example: (f) => ({ params: { farmId: f.farmId!, probeId: f.probeId! }, body: { label: 'Sonde (relabelled)' } }),
      handler: async ({ params, body, user }) => ({
        body: await probes.update(params.farmId, params.probeId, body, user?.id ?? null, broker),
      }),
    }),
    defineRoute({
      method: 'post',
      path: '/api/farms/:farmId/probes/:probeId/deactivate',
      summary: 'Deactivate a probe: its connection is closed and refused from now on. Audited.',
      tags: ['probes'],
      access: farmRoles('manager', 'admin'),
      params: probeParams,
      response: probeSchema,
      example: (f) => ({ params: { farmId: f.farmId!, probeId: f.probeId! } }),
      handler: async ({ params, user }) => ({ body: await probes.deactivate(params.farmId, params.probeId, user?.id ?? null, broker) }),
    }),
    defineRoute({
      method: 'post',
      path: '/api/farms/:farmId/probes/:probeId/credential',
      summary:
        'Rotate the probe’s secret: the new one is in this answer only; the old one is refused at once and the live connection closed. Audited.',
      tags: ['probes'],
      access: farmRoles('manager', 'admin'),
      params: probeParams,
      response: probeCredentialResponseSchema,
      example: (f) => ({ params: { farmId: f.farmId!, probeId: f.probeId! } }),
      handler: async ({ params, user }) => ({
        headers: noStore,
        body: await probes.rotateCredential(params.farmId, params.probeId, user?.id ?? null, broker),
      }),
    }),
    defineRoute({
      method: 'get',
      path: '/api/farms/:farmId/probes/:probeId/calibrations',
      summary: 'Calibration records of a probe, newest first.',
      tags: ['probes'],
      access: farmRoles(...ANY_FARM_ROLE),
      params: probeParams,
      response: calibrationListResponseSchema,
      example: (f) => ({ params: { farmId: f.farmId!, probeId: f.probeId! } }),
      handler: async ({ params }) => ({ body: { calibrations: await probes.listCalibrations(params.farmId, params.probeId) } }),
    }),
    defineRoute({
      method: 'post',
      path: '/api/farms/:farmId/probes/:probeId/calibrations',
      summary:
        'Record a calibration. pH: two buffers with mV (slope 95–105 % of Nernst, offset ±30 mV) and an optional check buffer (±0.1); conductivity/salinity: standard ±3 %; others: pass/fail. Next due +30 days (failed: due now). Audited.',
      tags: ['probes'],
      access: farmRoles('manager', 'admin'),
      params: probeParams,
      body: createCalibrationRequestSchema,
      response: calibrationSchema,
      example: (f) => ({
        params: { farmId: f.farmId!, probeId: f.probeId! },
        body: {
          quantity: 'ph',
          buffers: [
            { pH: 7.0, mV: -5.0 },
            { pH: 4.01, mV: 168.0 },
          ],
          check: { bufferPh: 10.01, readPh: 10.05 },
        },
      }),
      handler: async ({ params, body, user }) => ({
        status: 201,
        body: await probes.addCalibration(params.farmId, params.probeId, body, user?.id ?? null),
      }),
    }),
    defineRoute({
      method: 'get',
      path: '/api/farms/:farmId/probes/:probeId/maintenance-windows',
      summary: 'Maintenance windows of a probe: current, planned and those ended in the last 30 days.',
      tags: ['probes'],
      access: farmRoles(...ANY_FARM_ROLE),
      params: probeParams,
      response: maintenanceWindowListResponseSchema,
      example: (f) => ({ params: { farmId: f.farmId!, probeId: f.probeId! } }),
      handler: async ({ params }) => ({ body: { windows: await probes.listWindows(params.farmId, params.probeId) } }),
    }),
    defineRoute({
      method: 'post',
      path: '/api/farms/:farmId/probes/:probeId/maintenance-windows',
      summary:
        'Plan a maintenance window (cleaning, calibration): while it lasts the probe raises no silence or quality findings. Audited.',
      tags: ['probes'],
      access: farmRoles('manager', 'admin'),
      params: probeParams,
      body: createMaintenanceWindowRequestSchema,
      response: maintenanceWindowSchema,
      example: (f) => ({
        params: { farmId: f.farmId!, probeId: f.probeId! },
        body: {
          startsAt: new Date(Date.now() + 86_400_000).toISOString(),
          endsAt: new Date(Date.now() + 90_000_000).toISOString(),
          reason: 'cleaning',
        },
      }),
      handler: async ({ params, body, user }) => ({
        status: 201,
        body: await probes.addWindow(params.farmId, params.probeId, body, user?.id ?? null),
      }),
    }),
    defineRoute({
      method: 'delete',
      path: '/api/farms/:farmId/probes/:probeId/maintenance-windows/:windowId',
      summary:
        'Cancel a maintenance window. Idempotent: 204 also when the window is already gone (the probe must be on the farm). Audited when one was removed.',
      tags: ['probes'],
      access: farmRoles('manager', 'admin'),
      params: windowParams,
      // Cancelling is idempotent, so any window id makes a valid example.
      example: (f) => ({ params: { farmId: f.farmId!, probeId: f.probeId!, windowId: randomUUID() } }),
      handler: async ({ params, user }) => {
        await probes.deleteWindow(params.farmId, params.probeId, params.windowId, user?.id ?? null);
        return { status: 204 };
      },
    }),
    defineRoute({
      method: 'get',
      path: '/api/farms/:farmId/ingest',
      summary:
        'Ingest counters: the broker’s (this server process, all farms, since start) and this farm’s stored reject counts per probe and reason.',
      tags: ['probes'],
      access: farmRoles('manager', 'admin'),
      params: farmParams,
      response: ingestStatusResponseSchema,
      example: (f) => ({ params: { farmId: f.farmId! } }),
      handler: async ({ params }) => ({ body: await probes.ingestStatus(params.farmId, broker) }),
    }),
  ];
}
