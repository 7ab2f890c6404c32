import {
  meResponseSchema,
  type Locale,
  type MeFarm,
  type MeResponse,
  type Role,
} from '@shared/schemas/auth.schema';
import { queryOptions, useQuery, useQueryClient } from '@tanstack/react-query';
import { createContext, useCallback, useContext, useEffect, useMemo, useState, type ReactNode } from 'react';
import { api, isApiError, onUnauthorized } from './api-client';
import { setLocale } from './i18n';

export type UpdateMeRequest = { name?: string; locale?: Locale; prefs?: Partial<MeResponse['user']['prefs']> };

async function fetchMe({ signal }: { signal?: AbortSignal }): Promise<MeResponse | null> {
  try {
    return await api.get('/api/me', { schema: meResponseSchema, signal, skipAuthRedirect: true });
  } catch (e) {
    if (isApiError(e) && e.status === 401) return null;
    throw e;
  }
}

/** `null` data means "nobody is signed in". */
export const meQuery = queryOptions({
  queryKey: ['me'] as const,
  queryFn: fetchMe,
  staleTime: 5 * 60_000,
  retry: (count, error) => !(isApiError(error) && error.status < 500) && count < 2,
});

export type AuthStatus = 'loading' | 'signed-in' | 'signed-out' | 'error';
/** Why nobody is signed in: the user chose to sign out, or the session ended (expired, revoked, never there). */
export type SignedOutReason = 'user' | 'session';

export interface AuthContextValue {
  me: MeResponse | null;
  status: AuthStatus;
  signedOutReason: SignedOutReason;
  error: unknown;
  retry(): void;
  /** Store the answer of a successful sign-in. */
  setSignedIn(me: MeResponse): void;
  signOut(): Promise<void>;
  updateMe(patch: UpdateMeRequest): Promise<MeResponse>;
}

const AuthContext = createContext<AuthContextValue | null>(null);

export function AuthProvider({ children }: { children: ReactNode }) {
  const queryClient = useQueryClient();
  const query = useQuery(meQuery);
  const [signedOutReason, setSignedOutReason] = useState<SignedOutReason>('session');

  // Any 401 from any request: the session is gone. Drop every cached answer and the user.
  useEffect(
    () =>
      onUnauthorized(() => {
        setSignedOutReason('session');
        queryClient.removeQueries({ predicate: (q) => q.queryKey[0] !== meQuery.queryKey[0] });
        queryClient.setQueryData(meQuery.queryKey, null);
      }),
    [queryClient],
  );

  const me = query.data ?? null;
  const locale = me?.user.locale;
  useEffect(() => {
    if (locale) void setLocale(locale);
  }, [locale]);

  const setSignedIn = useCallback(
    (next: MeResponse) => {
      queryClient.setQueryData(meQuery.queryKey, next);
    },
    [queryClient],
  );

  const signOut = useCallback(async () => {
    setSignedOutReason('user');
    try {
      await api.post('/api/auth/logout', undefined, { skipAuthRedirect: true });
    } finally {
      queryClient.clear();
      queryClient.setQueryData(meQuery.queryKey, null);
    }
  }, [queryClient]);

  const updateMe = useCallback(
    async (patch: UpdateMeRequest) => {
      const next = await api.patch('/api/me', patch, { schema: meResponseSchema });
      queryClient.setQueryData(meQuery.queryKey, next);
      return next;
    },
    [queryClient],
  );

  const status: AuthStatus = query.isPending ? 'loading' : query.isError && !me ? 'error' : me ? 'signed-in' : 'signed-out';
  const { refetch } = query;

  const value = useMemo<AuthContextValue>(
    () => ({
      me,
      status,
      signedOutReason,
      error: query.error,
      retry: () => void refetch(),
      setSignedIn,
      signOut,
      updateMe,
    }),
    [me, status, signedOutReason, query.error, refetch, setSignedIn, signOut, updateMe],
  );
  return <AuthContext.Provider value={value}>{children}</AuthContext.Provider>;
}

export function useAuth(): AuthContextValue {
  const ctx = useContext(AuthContext);
  if (!ctx) throw new Error('useAuth must be used inside <AuthProvider>');
  return ctx;
}

/** The role a user acts in on one farm: admins are admins everywhere. */
export function roleOnFarm(me: MeResponse, farm: MeFarm): Role {
  return me.user.isAdmin ? 'admin' : farm.role;
}

export function findFarm(me: MeResponse | null, farmId: string | undefined): MeFarm | undefined {
  return farmId ? me?.farms.find((f) => f.id === farmId) : undefined;
}
