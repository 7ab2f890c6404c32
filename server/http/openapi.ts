import { z } from 'zod';
import type { RouteDef } from './route-registry';

const toSchema = (s: z.ZodType | undefined) => {
  if (!s) return undefined;
  try {
    return z.toJSONSchema(s, { unrepresentable: 'any', io: 'input' });
  } catch {
    return {};
  }
};

/** OpenAPI 3.1 document generated from the route registry's zod schemas. */
export function buildOpenApi(routes: RouteDef[]): Record<string, unknown> {
  const paths: Record<string, Record<string, unknown>> = {};
  for (const r of routes) {
    const path = r.path.replace(/:([A-Za-z]+)/g, '{$1}');
    const params = [...r.path.matchAll(/:([A-Za-z]+)/g)].map((m) => ({ name: m[1], in: 'path', required: true, schema: { type: 'string' } }));
    const query = toSchema(r.query) as { properties?: Record<string, unknown>; required?: string[] } | undefined;
    const queryParams = Object.entries(query?.properties ?? {}).map(([name, schema]) => ({
      name,
      in: 'query',
      required: query?.required?.includes(name) ?? false,
      schema,
    }));
    (paths[path] ??= {})[r.method] = {
      summary: r.summary,
      tags: r.tags,
      'x-gillwise-access': r.access,
      parameters: [...params, ...queryParams],
      ...(r.body ? { requestBody: { required: true, content: { 'application/json': { schema: toSchema(r.body) } } } } : {}),
      responses: {
        '2XX': r.response ? { description: 'Success', content: { 'application/json': { schema: toSchema(r.response) } } } : { description: 'Success' },
        default: { description: 'Error: { error: { code, message, details } }' },
      },
    };
  }
  return {
    openapi: '3.1.0',
    info: { title: 'Gillwise API', version: '1' },
    components: { securitySchemes: { session: { type: 'apiKey', in: 'cookie', name: 'gw_session' } } },
    security: [{ session: [] }],
    paths,
  };
}
