import { z, type ZodType } from 'zod';
import * as shared from '@hodboard/shared';
import { errorCodes } from '@hodboard/shared';
import type { ValidationSpec } from '../middleware/validate.js';

export interface DocumentedRoute {
  method: string;
  /** Express form, e.g. `/api/jobs/:id`. */
  path: string;
  spec?: ValidationSpec;
}

type JsonSchema = Record<string, unknown>;

const problemSchema = z.object({
  type: z.string(),
  title: z.string(),
  status: z.number().int(),
  detail: z.string().optional(),
  code: z.enum(errorCodes),
  errors: z.array(z.object({ path: z.string(), message: z.string() })).optional(),
});

/** Bodies that are not JSON: the validated fields ride in another media type. */
const otherMedia: Record<string, (schema: JsonSchema | undefined) => Record<string, { schema: JsonSchema }>> = {
  'POST /api/photos': (fields) => ({
    'multipart/form-data': {
      schema: { ...(fields ?? { type: 'object' }), properties: { ...((fields?.properties as object) ?? {}), photo: { type: 'string', contentMediaType: 'image/jpeg' } } },
    },
  }),
  'POST /api/materials/import': () => ({ 'text/csv': { schema: { type: 'string' } } }),
  // Stripe signs the raw bytes; the event shape is Stripe's own.
  'POST /api/payments/stripe-webhook': () => ({ 'application/json': { schema: { type: 'object' } } }),
};

const sessionFree = /^\/api\/(auth\/(?!me$)|public\/|payments\/stripe-webhook|health|openapi\.json)/;

export function toOpenApiPath(path: string): string {
  return path.replace(/:([A-Za-z_]+)/g, '{$1}');
}

function jsonSchema(schema: ZodType): JsonSchema {
  // Input side: that is what a client sends; refinements and transforms have no JSON Schema form.
  const { $schema: _ignored, ...rest } = z.toJSONSchema(schema, { target: 'draft-2020-12', io: 'input', unrepresentable: 'any' }) as JsonSchema;
  void _ignored;
  return rest;
}

/** Names a schema after its shared export (`jobInputSchema` → `JobInput`) so integrators see the same words. */
function sharedNames(): Map<unknown, string> {
  const names = new Map<unknown, string>();
  for (const [name, value] of Object.entries(shared)) {
    if (value instanceof z.ZodType && name.endsWith('Schema')) {
      const component = name.slice(0, -'Schema'.length);
      if (!names.has(value)) names.set(value, component.charAt(0).toUpperCase() + component.slice(1));
    }
  }
  return names;
}

function operationId(method: string, path: string): string {
  const words = path
    .replace(/^\/api\//, '')
    .split(/[/.-]/)
    .filter(Boolean)
    .map((word) => (word.startsWith(':') ? `by ${word.slice(1)}` : word))
    .join(' ')
    .split(' ');
  return [method.toLowerCase(), ...words.map((word) => word.charAt(0).toUpperCase() + word.slice(1))].join('');
}

function parametersFor(where: 'path' | 'query', schema: ZodType | undefined): JsonSchema[] {
  if (!schema) return [];
  const object = jsonSchema(schema);
  const properties = (object.properties ?? {}) as Record<string, JsonSchema>;
  const required = new Set((object.required as string[] | undefined) ?? []);
  return Object.entries(properties).map(([name, property]) => ({
    name,
    in: where,
    required: where === 'path' || required.has(name),
    schema: property,
  }));
}

/** An OpenAPI 3.1 document built from the zod schemas each live route validates with. */
export function buildOpenApiDocument(routes: DocumentedRoute[]): JsonSchema {
  const names = sharedNames();
  const components: Record<string, JsonSchema> = { Problem: jsonSchema(problemSchema) };
  const paths: Record<string, Record<string, JsonSchema>> = {};
  const problem = { 'application/problem+json': { schema: { $ref: '#/components/schemas/Problem' } } };

  for (const route of routes) {
    const key = `${route.method} ${route.path}`;
    const id = operationId(route.method, route.path);
    let body: JsonSchema | undefined;
    if (route.spec?.body) {
      const name = names.get(route.spec.body) ?? `${id.charAt(0).toUpperCase()}${id.slice(1)}Body`;
      components[name] ??= jsonSchema(route.spec.body);
      body = { $ref: `#/components/schemas/${name}` };
    }
    const media = otherMedia[key]?.(route.spec?.body ? components[(body!.$ref as string).split('/').pop()!] : undefined);
    const isOpen = sessionFree.test(route.path);
    const operation: JsonSchema = {
      operationId: id,
      tags: [route.path.split('/')[route.path.startsWith('/api/public/') ? 3 : 2]],
      parameters: [...parametersFor('path', route.spec?.params), ...parametersFor('query', route.spec?.query)],
      ...(body || media ? { requestBody: { required: true, content: media ?? { 'application/json': { schema: body } } } } : {}),
      responses: {
        '2XX': { description: 'Done' },
        '4XX': { description: 'The request was refused; `code` says why and `errors` lists fields to fix.', content: problem },
        '503': { description: 'The database is not reachable; retry shortly.', content: problem },
      },
      ...(isOpen ? { security: [] } : {}),
    };
    const openPath = toOpenApiPath(route.path);
    (paths[openPath] ??= {})[route.method.toLowerCase()] = operation;
  }

  return {
    openapi: '3.1.0',
    info: {
      title: 'Hodboard API',
      version: '1',
      description: 'Jobs, crews and the schedule of one building firm. Errors are RFC 9457 problem details.',
    },
    jsonSchemaDialect: 'https://json-schema.org/draft/2020-12/schema',
    servers: [{ url: '/' }],
    security: [{ bearer: [] }],
    paths,
    components: {
      schemas: components,
      securitySchemes: { bearer: { type: 'http', scheme: 'bearer', bearerFormat: 'JWT' } },
    },
  };
}
