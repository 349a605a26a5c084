import { z } from 'zod';
import { errorResponseSchema } from '../../shared/schemas/common';
import type { AnyRoute } from './route';

type JsonSchema = Record<string, unknown>;

/**
 * zod → JSON Schema (OpenAPI 3.0 dialect). Named schemas (`.meta({ id })`) are hoisted into `components.schemas`
 * and referenced from there; input and output forms get separate names where they differ.
 */
function makeConverter(components: Record<string, JsonSchema>) {
  return (schema: z.ZodType, io: 'input' | 'output'): JsonSchema => {
    const json = z.toJSONSchema(schema, { target: 'openapi-3.0', io, unrepresentable: 'any' }) as JsonSchema;
    delete json.$schema;
    const defs = (json.definitions ?? json.$defs ?? {}) as Record<string, JsonSchema>;
    delete json.definitions;
    delete json.$defs;
    const suffix = io === 'input' ? 'Input' : '';
    const rewrite = (v: JsonSchema): JsonSchema =>
      JSON.parse(
        JSON.stringify(v).replace(
          /"#\/(?:definitions|\$defs)\/([^"]+)"/g,
          (_m, name: string) => `"#/components/schemas/${name}${suffix}"`,
        ),
      );
    for (const [name, def] of Object.entries(defs)) components[`${name}${suffix}`] = rewrite(def);
    return rewrite(json);
  };
}

/** The OpenAPI 3.0 document, generated from the same route definitions and zod schemas the server validates with. */
export function buildOpenApi(routes: AnyRoute[], version: string): JsonSchema {
  const paths: Record<string, Record<string, unknown>> = {};
  const schemas: Record<string, JsonSchema> = {};
  const toJsonSchema = makeConverter(schemas);
  const errorSchema = toJsonSchema(errorResponseSchema, 'output');
  for (const r of routes) {
    const oaPath = '/api' + r.path.replace(/:([A-Za-z0-9_]+)/g, '{$1}');
    const params = [...r.path.matchAll(/:([A-Za-z0-9_]+)/g)].map((m) => ({
      name: m[1],
      in: 'path',
      required: true,
      schema: { type: 'string' },
    }));
    // Query parameters, one per property of the route's query schema (what the caller sends: the input form).
    if (r.query) {
      const q = toJsonSchema(r.query, 'input') as { properties?: Record<string, JsonSchema>; required?: string[] };
      for (const [name, schema] of Object.entries(q.properties ?? {})) {
        const { description, ...rest } = schema as JsonSchema & { description?: string };
        params.push({
          name,
          in: 'query',
          required: (q.required ?? []).includes(name),
          schema: rest as { type: string },
          ...(description ? { description } : {}),
        });
      }
    }
    const op: Record<string, unknown> = {
      summary: r.summary,
      tags: [r.tag],
      'x-access': r.access === 'public' || r.access === 'signed-in' ? r.access : [...r.access],
      parameters: params,
      responses: {
        [String(r.status ?? 200)]: r.produces
          ? { description: 'OK', content: { [r.produces]: { schema: { type: 'string', format: 'binary' } } } }
          : {
              description: 'OK',
              content: { 'application/json': { schema: r.response ? toJsonSchema(r.response, 'output') : {} } },
            },
        default: { description: 'Error', content: { 'application/json': { schema: errorSchema } } },
      },
    };
    if (r.access !== 'public') op.security = [{ bearer: [] }];
    if (r.body)
      op.requestBody = { required: true, content: { 'application/json': { schema: toJsonSchema(r.body, 'input') } } };
    paths[oaPath] ??= {};
    paths[oaPath][r.method] = op;
  }
  return {
    openapi: '3.0.3',
    info: { title: 'Emberline API', version, description: 'Arc-flash studies, clearing times and labels.' },
    components: { schemas, securitySchemes: { bearer: { type: 'http', scheme: 'bearer', bearerFormat: 'JWT' } } },
    paths,
  };
}
