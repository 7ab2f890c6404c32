import { Router, type NextFunction, type Request, type Response } from 'express';
import { z } from 'zod';
import type { Role } from '../../shared/schemas/auth.schema';
import { roleOnFarm, type AuthUser } from './auth-context';
import { forbidden, notFound, unauthorized, validationError } from './errors';
import type { RouteDef } from './route-registry';

export const SESSION_COOKIE = 'gw_session';

export type Authenticator = {
  authenticate(token: string): Promise<AuthUser | null>;
  shouldRenew(user: AuthUser): boolean;
  issueToken(userId: string, tokenVersion: number): string;
};

export type CookieOptions = { secure: boolean; maxAgeMs: number };

export function setSessionCookie(res: Response, token: string, opts: CookieOptions): void {
  res.cookie(SESSION_COOKIE, token, { httpOnly: true, sameSite: 'lax', secure: opts.secure, path: '/', maxAge: opts.maxAgeMs });
}
export function clearSessionCookie(res: Response, opts: CookieOptions): void {
  res.clearCookie(SESSION_COOKIE, { httpOnly: true, sameSite: 'lax', secure: opts.secure, path: '/' });
}

function tokenFrom(req: Request): string | null {
  const header = req.header('authorization');
  if (header?.startsWith('Bearer ')) return header.slice(7).trim() || null;
  const cookies = (req as Request & { cookies?: Record<string, string> }).cookies;
  return cookies?.[SESSION_COOKIE] ?? null;
}

const fieldErrors = (error: z.ZodError) => z.flattenError(error);

/**
 * Where a string (or object key) holding U+0000 sits in validated input, or null. PostgreSQL text and
 * jsonb cannot store that character, so such input would otherwise fail in SQL as a 500; it is refused
 * here, at the edge, for every route. Iterative with a node budget: input may be nested deeply.
 */
export function nulCharacterPath(value: unknown, budget = 100_000): string[] | null {
  const stack: Array<{ v: unknown; path: string[] }> = [{ v: value, path: [] }];
  while (stack.length && budget-- > 0) {
    const { v, path } = stack.pop()!;
    if (typeof v === 'string') {
      if (v.includes('\u0000')) return path;
      continue;
    }
    if (v === null || typeof v !== 'object') continue;
    for (const [k, child] of Object.entries(v)) {
      if (k.includes('\u0000')) return [...path, k];
      stack.push({ v: child, path: [...path, k] });
    }
  }
  return null;
}

const nulRefused = (path: string[]) =>
  validationError({ formErrors: [], fieldErrors: { [path[0] ?? '(root)']: ['must not contain the NUL character (U+0000)'] } });

type Authorized = { user: AuthUser | null; params: unknown; farmRole: Role | null };
const AUTHORIZED = Symbol('gillwise.route.authorized');
type WithAuthorized = Response & { locals: { [AUTHORIZED]?: Authorized } };

/**
 * Builds the Express router from the route registry: authenticate → params → farm scope → role, then
 * the route's `before` middlewares (multer, rate limits), then input → handler. Access is settled
 * before any `before` middleware runs, so an upload is never read (into memory or onto disk) for a
 * caller the route refuses.
 */
export function buildRouter(routes: RouteDef[], auth: Authenticator, cookie: CookieOptions): Router {
  const router = Router();
  for (const route of routes) {
    const authorize = async (req: Request, res: Response, next: NextFunction) => {
      try {
        let user: AuthUser | null = null;
        const token = tokenFrom(req);
        if (token) user = await auth.authenticate(token);
        if (route.access.kind !== 'public' && !user) throw unauthorized();
        if (user && token && !req.header('authorization') && auth.shouldRenew(user)) {
          setSessionCookie(res, auth.issueToken(user.id, user.tokenVersion), cookie);
        }
        // A malformed id in the path names nothing: 404, like an id that does not exist.
        const params = route.params ? route.params.safeParse(req.params) : { success: true as const, data: req.params };
        if (!params.success || nulCharacterPath(params.data)) throw notFound();
        let farmRole: Role | null = null;
        if (route.access.kind === 'roles') {
          if (!user) throw unauthorized();
          if (route.access.farmScoped) {
            const farmId = (params.data as { farmId?: string }).farmId;
            farmRole = farmId ? roleOnFarm(user, farmId) : null;
            if (!farmRole) throw notFound('Farm');
            if (!route.access.roles.includes(farmRole)) throw forbidden();
          } else {
            const effective = user.isAdmin ? 'admin' : null;
            const any = [...user.memberships.values()];
            const allowed = route.access.roles.some((r) => r === effective || any.includes(r as never));
            if (!allowed) throw forbidden();
          }
        }
        (res as WithAuthorized).locals[AUTHORIZED] = { user, params: params.data, farmRole };
        next();
      } catch (err) {
        next(err);
      }
    };
    const handler = async (req: Request, res: Response, next: NextFunction) => {
      try {
        const authorized = (res as WithAuthorized).locals[AUTHORIZED];
        if (!authorized) throw new Error(`route ${route.method} ${route.path} ran without its access check`);
        const { user, params, farmRole } = authorized;
        const query = route.query ? route.query.safeParse(req.query) : { success: true as const, data: req.query };
        if (!query.success) throw validationError(fieldErrors(query.error), 'Some query parameters are not valid.');
        const nulInQuery = nulCharacterPath(query.data);
        if (nulInQuery) throw nulRefused(nulInQuery);
        const body = route.body ? route.body.safeParse(req.body ?? {}) : { success: true as const, data: req.body };
        if (!body.success) throw validationError(fieldErrors(body.error));
        const nulInBody = nulCharacterPath(body.data);
        if (nulInBody) throw nulRefused(nulInBody);
        const result = await route.handler({
          params,
          query: query.data,
          body: body.data,
          user,
          farmRole,
          req,
          res,
        });
        if (route.kind === 'raw') return;
        if (result?.headers) for (const [k, v] of Object.entries(result.headers)) res.setHeader(k, v);
        const status = result?.status ?? (result?.body === undefined ? 204 : 200);
        if (result?.body === undefined) res.status(status).end();
        else res.status(status).json(result.body);
      } catch (err) {
        next(err);
      }
    };
    router[route.method](route.path, authorize, ...(route.before ?? []), handler);
  }
  return router;
}
