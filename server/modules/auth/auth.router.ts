import { rateLimit } from 'express-rate-limit';
import type { Request, Response } from 'express';
import {
  loginRequestSchema,
  meResponseSchema,
  passwordResetConfirmSchema,
  passwordResetRequestSchema,
  updateMeRequestSchema,
} from '../../../shared/schemas/auth.schema';
import { clearSessionCookie, setSessionCookie, type CookieOptions } from '../../http/build-router';
import { tooManyRequests, unauthorized } from '../../http/errors';
import { defineRoute, publicAccess, sessionAccess, type RouteDef } from '../../http/route-registry';
import type { AuthService } from './auth.service';

const emailKey = (req: Request) => `email:${String((req.body as { email?: unknown } | undefined)?.email ?? '').trim().toLowerCase()}`;

function limiter(limit: number, windowMs: number, keyGenerator?: (req: Request) => string) {
  return rateLimit({
    windowMs,
    limit,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    ...(keyGenerator ? { keyGenerator } : {}),
    handler: (_req: Request, _res: Response, next) => next(tooManyRequests()),
  });
}

export function authRoutes(auth: AuthService, cookie: CookieOptions, limits = { perIp: 20, perEmail: 8, windowMs: 15 * 60_000 }): RouteDef[] {
  // Per IP and per e-mail, so neither one address nor one account can be hammered.
  const loginLimits = [limiter(limits.perIp, limits.windowMs), limiter(limits.perEmail, limits.windowMs, emailKey)];
  const resetLimits = [limiter(limits.perIp, limits.windowMs), limiter(Math.max(3, limits.perEmail / 2), limits.windowMs, emailKey)];
  return [
    defineRoute({
      method: 'post',
      path: '/api/auth/login',
      summary: 'Sign in with e-mail and password; sets the session cookie.',
      tags: ['auth'],
      access: publicAccess,
      body: loginRequestSchema,
      response: meResponseSchema,
      before: loginLimits,
      handler: async ({ body, res }) => {
        const { token, me } = await auth.login(body.email, body.password);
        setSessionCookie(res, token, cookie);
        return { body: me };
      },
    }),
    defineRoute({
      method: 'post',
      path: '/api/auth/logout',
      summary: 'Sign out: clears the session cookie.',
      tags: ['auth'],
      access: publicAccess,
      handler: ({ res }) => {
        clearSessionCookie(res, cookie);
        return { status: 204 };
      },
    }),
    defineRoute({
      method: 'post',
      path: '/api/auth/password-reset',
      summary: 'E-mail a single-use reset link. Always answers 202, whether or not the address exists.',
      tags: ['auth'],
      access: publicAccess,
      body: passwordResetRequestSchema,
      before: resetLimits,
      handler: async ({ body }) => {
        await auth.requestPasswordReset(body.email);
        return { status: 202, body: { ok: true, message: 'If that address belongs to an account, a reset link is on its way.' } };
      },
    }),
    defineRoute({
      method: 'post',
      path: '/api/auth/password-reset/confirm',
      summary: 'Set a new password with a reset or invitation token.',
      tags: ['auth'],
      access: publicAccess,
      body: passwordResetConfirmSchema,
      before: resetLimits.slice(0, 1),
      handler: async ({ body }) => {
        await auth.confirmPasswordReset(body.token, body.password);
        return { status: 204 };
      },
    }),
    defineRoute({
      method: 'get',
      path: '/api/me',
      summary: 'The signed-in user, their farms and role on each.',
      tags: ['auth'],
      access: sessionAccess,
      response: meResponseSchema,
      example: () => ({}),
      handler: async ({ user }) => {
        if (!user) throw unauthorized();
        return { body: await auth.me(user.id) };
      },
    }),
    defineRoute({
      method: 'patch',
      path: '/api/me',
      summary: 'Update name, language and display preferences.',
      tags: ['auth'],
      access: sessionAccess,
      body: updateMeRequestSchema,
      response: meResponseSchema,
      example: () => ({ body: { locale: 'en' } }),
      handler: async ({ user, body }) => {
        if (!user) throw unauthorized();
        return { body: await auth.updateMe(user.id, body) };
      },
    }),
  ];
}
