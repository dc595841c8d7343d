import { API_ROLES, apiErrorSchema } from '@thermargin/shared';
import type { RouteSpec } from '@thermargin/shared/api-routes';
import { z } from 'zod';

const json = (schema: z.ZodType, io: 'input' | 'output') => ({
  'application/json': { schema: z.toJSONSchema(schema, { io, unrepresentable: 'any' }) },
});

/** `/api/vehicles/:id` → `/api/vehicles/{id}`. */
const openapiPath = (p: string) => p.replace(/:([A-Za-z_]+)/g, '{$1}');

/** The OpenAPI 3.1 document, generated from the same route table and zod schemas that validate requests. */
export function openApiDocument(routes: Readonly<Record<string, RouteSpec>>): Record<string, unknown> {
  const paths: Record<string, Record<string, unknown>> = {};
  for (const r of Object.values(routes)) {
    const params = [...r.path.matchAll(/:([A-Za-z_]+)/g)].map((m) => ({
      name: m[1],
      in: 'path',
      required: true,
      schema: { type: 'string', pattern: '^[A-Za-z0-9][A-Za-z0-9_.:-]{0,63}$' },
    }));
    const query = r.query
      ? (z.toJSONSchema(r.query, { io: 'input', unrepresentable: 'any' }) as {
          properties?: Record<string, unknown>;
          required?: string[];
        })
      : undefined;
    for (const [name, schema] of Object.entries(query?.properties ?? {}))
      params.push({ name, in: 'query', required: query?.required?.includes(name) ?? false, schema } as never);
    const errors = Object.fromEntries(
      ['400', '401', '403', '404', '429', '500'].map((s) => [
        s,
        { description: 'error', content: json(apiErrorSchema, 'output') },
      ]),
    );
    const operation = {
      summary: r.summary,
      ...(r.role ? { security: [{ bearer: [] }], 'x-role': r.role } : {}),
      parameters: params,
      ...(r.body ? { requestBody: { required: true, content: json(r.body, 'input') } } : {}),
      responses: {
        '200': r.response
          ? { description: 'ok', content: json(r.response, 'output') }
          : { description: 'ok', content: { 'text/event-stream': { schema: { type: 'string' } } } },
        ...errors,
      },
    };
    (paths[openapiPath(r.path)] ??= {})[r.method] = operation;
    for (const old of r.old_paths ?? [])
      (paths[openapiPath(old)] ??= {})[r.method] = {
        ...operation,
        summary: `Old path of ${r.path}, answered until the next release: ${r.summary}`,
        deprecated: true,
      };
  }
  return {
    openapi: '3.1.0',
    info: {
      title: 'thermargin API',
      version: '1',
      description: `Bearer tokens with roles ${API_ROLES.join(' < ')}: each route names the least role it needs (x-role).`,
    },
    components: { securitySchemes: { bearer: { type: 'http', scheme: 'bearer' } } },
    paths,
  };
}
