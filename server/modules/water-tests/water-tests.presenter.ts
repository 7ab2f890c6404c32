import type { FreeAmmoniaResultDto, WaterTestDto } from '../../../shared/schemas/water-tests.schema';
import type { FreeAmmoniaResult, WaterTest } from '../../db/entities';

export function presentResult(r: FreeAmmoniaResult): FreeAmmoniaResultDto {
  return {
    id: r.id,
    waterTestId: r.waterTestId,
    unitId: r.unitId,
    sampledAt: r.sampledAt.toISOString(),
    status: r.status,
    tanMgL: r.tanMgL,
    nh3NMgL: r.nh3NMgL,
    nh3MgL: r.nh3MgL,
    fraction: r.fraction,
    pKa: r.pKa,
    method: r.method,
    pHScale: r.pHScale,
    pH: r.ph,
    temperatureC: r.temperatureC,
    salinityPpt: r.salinityPpt,
    provenance: r.provenance as FreeAmmoniaResultDto['provenance'],
    flags: r.flags,
    forecastPeak: r.forecastPeak as FreeAmmoniaResultDto['forecastPeak'],
    computedAt: r.computedAt.toISOString(),
    testVersion: r.testVersion,
  };
}

export function presentTest(t: WaterTest, result: FreeAmmoniaResult | null): WaterTestDto {
  return {
    id: t.id,
    farmId: t.farmId,
    unitId: t.unitId,
    clientId: t.clientId,
    analyte: t.analyte as WaterTestDto['analyte'],
    method: t.method as WaterTestDto['method'],
    basis: t.basis,
    value: t.value,
    unit: t.unit,
    sampledAt: t.sampledAt.toISOString(),
    handheldPh: t.handheldPh,
    handheldTemperatureC: t.handheldTemperatureC,
    handheldSalinityPpt: t.handheldSalinityPpt,
    aeratorOn: t.aeratorOn,
    note: t.note,
    photoUrl: t.photoPath ? `/api/farms/${t.farmId}/photos/${t.photoPath}` : null,
    source: t.source,
    enteredById: t.enteredById,
    version: t.version,
    createdAt: t.createdAt.toISOString(),
    updatedAt: t.updatedAt.toISOString(),
    // A result computed from an older version of the test is not this test's result any more.
    result: result && result.testVersion === t.version ? presentResult(result) : null,
  };
}
