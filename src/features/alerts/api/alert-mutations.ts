import { alertSchema, type AlertDto } from '@shared/schemas/alerts.schema';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { alertsPath } from './alert-queries';
import { alertKeys } from './keys';

type Action = 'acknowledge' | 'assign' | 'resolve';

function postAction(farmId: string, alertId: string, action: Action, body: Record<string, unknown>) {
  return api.post<AlertDto>(`${alertsPath(farmId)}/${encodeURIComponent(alertId)}/${action}`, body, { schema: alertSchema });
}

/**
 * One mutation hook per action. On success the alert lists refresh at once; other screens that show
 * alerts (map, unit) refresh through the live 'alert' event the server sends for the change.
 */
function useAlertAction<V>(farmId: string, action: Action, toBody: (v: V) => Record<string, unknown>, onDone?: (alert: AlertDto) => void) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ alertId, ...v }: { alertId: string } & V) => postAction(farmId, alertId, action, toBody(v as V)),
    // Hook-level callbacks run even when the card that started the action is gone (the refetched list may drop it).
    onSuccess: (alert) => {
      onDone?.(alert);
      return queryClient.invalidateQueries({ queryKey: alertKeys.all(farmId) });
    },
  });
}

export function useAcknowledgeAlert(farmId: string, onDone?: (alert: AlertDto) => void) {
  return useAlertAction<{ note?: string }>(farmId, 'acknowledge', ({ note }) => (note ? { note } : {}), onDone);
}

export function useAssignAlert(farmId: string, onDone?: (alert: AlertDto) => void) {
  return useAlertAction<{ userId: string; note?: string }>(
    farmId,
    'assign',
    ({ userId, note }) => (note ? { userId, note } : { userId }),
    onDone,
  );
}

export function useResolveAlert(farmId: string, onDone?: (alert: AlertDto) => void) {
  return useAlertAction<{ note: string }>(farmId, 'resolve', ({ note }) => ({ note }), onDone);
}
