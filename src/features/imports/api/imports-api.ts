import { apiErrorSchema, CLIENT_HEADER } from '@shared/schemas/auth.schema';
import {
  importStatusSchema,
  importUploadResponseSchema,
  type ImportCommitRequest,
  type ImportMapping,
  type ImportStatus,
  type ImportUploadResponse,
} from '@shared/schemas/imports.schema';
import { unitListResponseSchema } from '@shared/schemas/units.schema';
import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import { api, ApiError, apiUrl } from '@/lib/api-client';
import { importKeys } from './keys';

export const farmApi = (farmId: string) => `/api/farms/${encodeURIComponent(farmId)}`;
export const REJECTS_PAGE = 50;

/**
 * POST …/imports as multipart (field "file") with the client header, through XMLHttpRequest so a big
 * file shows its upload progress. Errors come back as ApiError, like every other request.
 */
export function uploadCsv(
  farmId: string,
  file: File,
  onProgress?: (fraction: number) => void,
  signal?: AbortSignal,
): Promise<ImportUploadResponse> {
  return new Promise((resolve, reject) => {
    const xhr = new XMLHttpRequest();
    xhr.open('POST', apiUrl(`${farmApi(farmId)}/imports`));
    xhr.withCredentials = true;
    xhr.setRequestHeader(CLIENT_HEADER, 'web');
    xhr.setRequestHeader('accept', 'application/json');
    xhr.upload.onprogress = (e) => {
      if (e.lengthComputable) onProgress?.(e.loaded / e.total);
    };
    xhr.onerror = () => reject(new ApiError({ status: 0, code: 'network', message: 'The server could not be reached.' }));
    xhr.onabort = () => reject(new DOMException('aborted', 'AbortError'));
    xhr.onload = () => {
      let body: unknown = undefined;
      try {
        body = xhr.responseText ? JSON.parse(xhr.responseText) : undefined;
      } catch {
        /* not JSON */
      }
      if (xhr.status >= 200 && xhr.status < 300) {
        const parsed = importUploadResponseSchema.safeParse(body);
        if (parsed.success) resolve(parsed.data);
        else reject(new ApiError({ status: xhr.status, code: 'bad_response', message: 'The server answered something unexpected.' }));
        return;
      }
      const err = apiErrorSchema.safeParse(body);
      reject(
        err.success
          ? new ApiError({ status: xhr.status, ...err.data.error })
          : new ApiError({
              status: xhr.status,
              code: xhr.status === 413 ? 'payload_too_large' : `http_${xhr.status}`,
              message: xhr.statusText || `Request failed with status ${xhr.status}`,
            }),
      );
    };
    signal?.addEventListener('abort', () => xhr.abort());
    const form = new FormData();
    form.append('file', file, file.name);
    xhr.send(form);
  });
}

const running = (s: ImportStatus | undefined) => s?.state === 'validating' || s?.state === 'committing';

/** Query options of the imports feature (keys in ./keys). */
export const importQueries = {
  all: importKeys.all,
  /** The import's state and a page of rejected rows; polled every second while it validates or commits. */
  status: (farmId: string, importId: string, rejectsOffset = 0) =>
    queryOptions({
      queryKey: importKeys.status(farmId, importId, rejectsOffset),
      queryFn: ({ signal }) =>
        api.get(`${farmApi(farmId)}/imports/${encodeURIComponent(importId)}`, {
          schema: importStatusSchema,
          signal,
          query: { rejectsOffset, rejectsLimit: REJECTS_PAGE },
        }),
      refetchInterval: (q) => (running(q.state.data) ? 1000 : false),
    }),
  units: (farmId: string) =>
    queryOptions({
      queryKey: importKeys.units(farmId),
      queryFn: async ({ signal }) => (await api.get(`${farmApi(farmId)}/units`, { schema: unitListResponseSchema, signal })).units,
      staleTime: 5 * 60_000,
    }),
};

function usePutStatus(farmId: string) {
  const queryClient = useQueryClient();
  return (s: ImportStatus) => {
    queryClient.setQueryData(importKeys.status(farmId, s.importId, 0), s);
    return queryClient.invalidateQueries({ queryKey: [...importKeys.all(farmId), 'status', s.importId] });
  };
}

export function useValidateImport(farmId: string) {
  const put = usePutStatus(farmId);
  return useMutation({
    mutationFn: ({ importId, mapping }: { importId: string; mapping: ImportMapping }) =>
      api.post(`${farmApi(farmId)}/imports/${encodeURIComponent(importId)}/validate`, { mapping }, { schema: importStatusSchema }),
    onSuccess: put,
  });
}

export function useCommitImport(farmId: string) {
  const put = usePutStatus(farmId);
  return useMutation({
    mutationFn: ({ importId, ...body }: { importId: string } & ImportCommitRequest) =>
      api.post(`${farmApi(farmId)}/imports/${encodeURIComponent(importId)}/commit`, body, { schema: importStatusSchema }),
    onSuccess: put,
  });
}

/** Where the CSV exports are, for a unit (or the whole farm) and a range of instants. */
export function exportHref(
  farmId: string,
  kind: 'readings' | 'tests' | 'results',
  q: { unitId?: string; from: string; to: string },
): string {
  return apiUrl(`${farmApi(farmId)}/exports/${kind}.csv`, { unitId: q.unitId, from: q.from, to: q.to });
}
