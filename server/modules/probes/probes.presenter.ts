import type { CalibrationDto, MaintenanceWindowDto, ProbeDto, ProbeHealth } from '../../../shared/schemas/probes.schema';
import type { Probe, ProbeCalibration, ProbeMaintenanceWindow } from '../../db/entities';

/** The probe's own fields (what audit entries record); never the secret hash. */
export function presentProbeFields(p: Probe): Omit<ProbeDto, 'health'> {
  return {
    id: p.id,
    farmId: p.farmId,
    unitId: p.unitId,
    probeKey: p.probeKey,
    label: p.label,
    model: p.model,
    quantities: p.quantities,
    intervalSeconds: p.intervalSeconds,
    active: p.active,
    secretRotatedAt: p.secretRotatedAt.toISOString(),
    lastSeenAt: p.lastSeenAt?.toISOString() ?? null,
    batteryPct: p.batteryPct,
    rssiDbm: p.rssiDbm,
    createdAt: p.createdAt.toISOString(),
  };
}

export function presentProbe(p: Probe, health: ProbeHealth): ProbeDto {
  return { ...presentProbeFields(p), health };
}

export function presentCalibration(c: ProbeCalibration): CalibrationDto {
  return {
    id: c.id,
    probeId: c.probeId,
    quantity: c.quantity,
    performedAt: c.performedAt.toISOString(),
    performedById: c.performedById,
    method: c.method,
    details: c.details,
    passed: c.passed,
    nextDueAt: c.nextDueAt.toISOString(),
    note: c.note,
    createdAt: c.createdAt.toISOString(),
  };
}

export function presentWindow(w: ProbeMaintenanceWindow, now = new Date()): MaintenanceWindowDto {
  return {
    id: w.id,
    probeId: w.probeId,
    startsAt: w.startsAt.toISOString(),
    endsAt: w.endsAt.toISOString(),
    reason: w.reason,
    createdById: w.createdById,
    createdAt: w.createdAt.toISOString(),
    current: w.startsAt.getTime() <= now.getTime() && now.getTime() < w.endsAt.getTime(),
  };
}
