import { onCallResponseSchema, type PutOnCallRequest } from '@shared/schemas/alerts.schema';
import { feedingTableSchema, type PatchFeedingTable } from '@shared/schemas/feed.schema';
import { personSchema, type InviteRequest } from '@shared/schemas/people.schema';
import {
  calibrationSchema,
  maintenanceWindowSchema,
  probeCredentialResponseSchema,
  probeSchema,
  type CreateCalibrationRequest,
  type CreateMaintenanceWindowRequest,
  type CreateProbeRequest,
  type UpdateProbeRequest,
} from '@shared/schemas/probes.schema';
import { thresholdProfileSchema, type UpdateThresholdProfileRequest } from '@shared/schemas/thresholds.schema';
import {
  flowMeasurementSchema,
  unitSchema,
  type CreateFlowRequest,
  type CreateUnitRequest,
  type UpdateUnitRequest,
} from '@shared/schemas/units.schema';
import { useMutation, useQueryClient, type QueryKey } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { farmApi, setupKeys } from './keys';

function useSetupMutation<V, R>(fn: (v: V) => Promise<R>, stale: QueryKey[], options: { gcTime?: number } = {}) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: fn,
    gcTime: options.gcTime,
    onSuccess: () => Promise.all(stale.map((queryKey) => queryClient.invalidateQueries({ queryKey }))),
  });
}

const enc = encodeURIComponent;

// --- units ---

export function useCreateUnit(farmId: string) {
  return useSetupMutation(
    (body: CreateUnitRequest) => api.post(`${farmApi(farmId)}/units`, body, { schema: unitSchema }),
    [setupKeys.units(farmId)],
  );
}

export function useUpdateUnit(farmId: string) {
  return useSetupMutation(
    ({ unitId, body }: { unitId: string; body: UpdateUnitRequest }) =>
      api.patch(`${farmApi(farmId)}/units/${enc(unitId)}`, body, { schema: unitSchema }),
    [setupKeys.units(farmId)],
  );
}

export function useAddFlow(farmId: string) {
  return useSetupMutation(
    ({ unitId, body }: { unitId: string; body: CreateFlowRequest }) =>
      api.post(`${farmApi(farmId)}/units/${enc(unitId)}/flows`, body, { schema: flowMeasurementSchema }),
    [setupKeys.units(farmId)],
  );
}

// --- probes ---
// The credential answers carry the probe's secret: their mutation results are dropped from the cache at once.

export function useCreateProbe(farmId: string) {
  return useSetupMutation(
    (body: CreateProbeRequest) => api.post(`${farmApi(farmId)}/probes`, body, { schema: probeCredentialResponseSchema }),
    [setupKeys.probes(farmId)],
    { gcTime: 0 },
  );
}

export function useRotateCredential(farmId: string) {
  return useSetupMutation(
    ({ probeId }: { probeId: string }) =>
      api.post(`${farmApi(farmId)}/probes/${enc(probeId)}/credential`, {}, { schema: probeCredentialResponseSchema }),
    [setupKeys.probes(farmId)],
    { gcTime: 0 },
  );
}

export function useUpdateProbe(farmId: string) {
  return useSetupMutation(
    ({ probeId, body }: { probeId: string; body: UpdateProbeRequest }) =>
      api.patch(`${farmApi(farmId)}/probes/${enc(probeId)}`, body, { schema: probeSchema }),
    [setupKeys.probes(farmId)],
  );
}

export function useDeactivateProbe(farmId: string) {
  return useSetupMutation(
    ({ probeId }: { probeId: string }) => api.post(`${farmApi(farmId)}/probes/${enc(probeId)}/deactivate`, {}, { schema: probeSchema }),
    [setupKeys.probes(farmId)],
  );
}

export function useAddCalibration(farmId: string, probeId: string) {
  return useSetupMutation(
    (body: CreateCalibrationRequest) =>
      api.post(`${farmApi(farmId)}/probes/${enc(probeId)}/calibrations`, body, { schema: calibrationSchema }),
    [setupKeys.calibrations(farmId, probeId), setupKeys.probes(farmId)],
  );
}

export function useAddWindow(farmId: string, probeId: string) {
  return useSetupMutation(
    (body: CreateMaintenanceWindowRequest) =>
      api.post(`${farmApi(farmId)}/probes/${enc(probeId)}/maintenance-windows`, body, { schema: maintenanceWindowSchema }),
    [setupKeys.windows(farmId, probeId), setupKeys.probes(farmId)],
  );
}

export function useDeleteWindow(farmId: string, probeId: string) {
  return useSetupMutation(
    ({ windowId }: { windowId: string }) => api.delete(`${farmApi(farmId)}/probes/${enc(probeId)}/maintenance-windows/${enc(windowId)}`),
    [setupKeys.windows(farmId, probeId), setupKeys.probes(farmId)],
  );
}

// --- thresholds, feeding tables, on-call, people ---

export function useUpdateThresholdProfile(farmId: string) {
  return useSetupMutation(
    ({ profileId, body }: { profileId: string; body: UpdateThresholdProfileRequest }) =>
      api.patch(`${farmApi(farmId)}/threshold-profiles/${enc(profileId)}`, body, { schema: thresholdProfileSchema }),
    [setupKeys.thresholds(farmId)],
  );
}

export function useUpdateFeedingTable(farmId: string) {
  return useSetupMutation(
    ({ tableId, body }: { tableId: string; body: PatchFeedingTable }) =>
      api.patch(`${farmApi(farmId)}/feeding-tables/${enc(tableId)}`, body, { schema: feedingTableSchema }),
    [setupKeys.feedingTables(farmId)],
  );
}

export function usePutOnCall(farmId: string) {
  return useSetupMutation(
    (body: PutOnCallRequest) => api.put(`${farmApi(farmId)}/on-call`, body, { schema: onCallResponseSchema }),
    [setupKeys.onCall(farmId)],
  );
}

export function useInvitePerson(farmId: string) {
  return useSetupMutation(
    (body: InviteRequest) => api.post(`${farmApi(farmId)}/people`, body, { schema: personSchema }),
    [setupKeys.people(farmId)],
  );
}

export function useUpdatePerson(farmId: string) {
  return useSetupMutation(
    ({ userId, body }: { userId: string; body: { role?: 'hand' | 'manager' | 'planner'; active?: boolean } }) =>
      api.patch(`${farmApi(farmId)}/people/${enc(userId)}`, body, { schema: personSchema }),
    [setupKeys.people(farmId), setupKeys.onCall(farmId)],
  );
}
