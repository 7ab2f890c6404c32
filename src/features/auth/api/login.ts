import { meResponseSchema, type LoginRequest, type MeResponse } from '@shared/schemas/auth.schema';
import { useMutation } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { useAuth } from '@/lib/auth';

/** POST /api/auth/login → MeResponse (the session cookie is set by the server, httpOnly). */
export function login(body: LoginRequest): Promise<MeResponse> {
  // A 401 here means "wrong e-mail or password", not "session expired".
  return api.post('/api/auth/login', body, { schema: meResponseSchema, skipAuthRedirect: true });
}

export function useLogin() {
  const { setSignedIn } = useAuth();
  return useMutation({
    mutationFn: login,
    onSuccess: (me) => setSignedIn(me),
  });
}
