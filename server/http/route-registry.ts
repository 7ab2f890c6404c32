import type { NextFunction, Request, Response } from 'express';
import { z } from 'zod';
import type { Role } from '../../shared/schemas/auth.schema';
import type { AuthUser } from './auth-context';

export type HttpMethod = 'get' | 'post' | 'put' | 'patch' | 'delete';

/**
 * Who may call a route. `public`: anyone. `session`: any signed-in user. Otherwise the roles allowed;
 * with `farmScoped` the route has a `:farmId` and the user must belong to that farm (or be an admin),
 * else it answers 404 as if the farm did not exist.
 */
export type Access =
  | { kind: 'public' }
  | { kind: 'session' }
  | { kind: 'roles'; roles: readonly Role[]; farmScoped: boolean };

export const publicAccess: Access = { kind: 'public' };
export const sessionAccess: Access = { kind: 'session' };
export const farmRoles = (...roles: Role[]): Access => ({ kind: 'roles', roles, farmScoped: true });
export const globalRoles = (...roles: Role[]): Access => ({ kind: 'roles', roles, farmScoped: false });
export const ANY_FARM_ROLE: Role[] = ['hand', 'manager', 'planner', 'admin'];

export type RouteContext<P, Q, B> = {
  params: P;
  query: Q;
  body: B;
  user: AuthUser | null;
  /** The caller's role on the route's farm (farm-scoped routes only). */
  farmRole: Role | null;
  req: Request;
  res: Response;
};

export type RouteResult = { status?: number; body?: unknown; headers?: Record<string, string> } | undefined;

/** Ids of a seeded fixture, used by the route × role test to build a valid request for any route. */
export type RouteFixture = Record<string, string>;
export type RouteExample = {
  params?: Record<string, string>;
  query?: Record<string, unknown>;
  body?: unknown;
  /** A multipart upload instead of a JSON body. */
  upload?: { field: string; base64: string; name: string };
};

export type RouteDef<P extends z.ZodType = z.ZodType, Q extends z.ZodType = z.ZodType, B extends z.ZodType = z.ZodType> = {
  method: HttpMethod;
  path: string;
  summary: string;
  tags: string[];
  access: Access;
  params?: P;
  query?: Q;
  body?: B;
  response?: z.ZodType;
  /** 'json' (default) answers with res.json; 'raw' handlers write the response themselves (SSE, CSV, files). */
  kind?: 'json' | 'raw';
  /** Express middlewares run before validation (multer for uploads, rate limits). */
  before?: Array<(req: Request, res: Response, next: NextFunction) => void>;
  /** A valid request for the route × role test, built from the fixture's ids. */
  example?: (fixture: RouteFixture) => RouteExample;
  /** Success status the example should produce (default 2xx). */
  handler: (ctx: RouteContext<z.output<P>, z.output<Q>, z.output<B>>) => Promise<RouteResult> | RouteResult;
};

export function defineRoute<P extends z.ZodType = z.ZodObject, Q extends z.ZodType = z.ZodObject, B extends z.ZodType = z.ZodUnknown>(
  def: RouteDef<P, Q, B>,
): RouteDef {
  return def as unknown as RouteDef;
}

/** Params schema for farm-scoped paths; extended by modules for :unitId and others. */
export const farmParams = z.object({ farmId: z.uuid() });
export const unitParams = farmParams.extend({ unitId: z.uuid() });
