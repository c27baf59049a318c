import { z } from 'zod';
import { screeningInputSchema, soundingLevelSchema, compareCruiseLevelsOptionsSchema } from '@/lib/validation/screening';
import { workspaceCreateSchema, apiKeyCreateSchema } from '@/lib/validation/workspaces';

/**
 * The OpenAPI 3.1 document of /api/v1, with request schemas generated from the same zod schemas the
 * handlers validate with. Every v1 route.ts must appear here (a test walks app/api/v1 to check).
 */
type Method = 'get' | 'post' | 'put' | 'patch' | 'delete';

export interface OperationSpec {
  summary: string;
  permission?: string;
  requestBody?: z.ZodType | { multipart: Record<string, string> };
  query?: Record<string, string>;
  responses: Record<string, string>;
}

const schema = (s: z.ZodType) => z.toJSONSchema(s, { target: 'draft-2020-12', unrepresentable: 'any', io: 'input' });

const ERRORS = { '400': 'Unreadable body', '401': 'Not signed in and no key', '403': 'Role lacks permission', '404': 'Unknown or not yours', '422': 'Invalid fields', '429': 'Throttled' };

export const API_OPERATIONS: Record<string, Partial<Record<Method, OperationSpec>>> = {
  '/workspaces': {
    get: { summary: "The caller's workspaces, each { slug, name, role }", responses: { '200': 'List' } },
    post: { summary: 'Create a workspace; the creator is owner', requestBody: workspaceCreateSchema, responses: { '201': 'Created', '409': 'Address taken' } },
  },
  '/workspaces/{slug}/api-keys': {
    get: { summary: 'Active API keys (never the keys themselves)', permission: 'apikeys:manage', responses: { '200': 'List' } },
    post: { summary: 'Create a key; the key is returned once', permission: 'apikeys:manage', requestBody: apiKeyCreateSchema, responses: { '201': '{ id, name, role, key }' } },
  },
  '/workspaces/{slug}/api-keys/{id}': {
    delete: { summary: 'Revoke a key', permission: 'apikeys:manage', responses: { '204': 'Revoked' } },
  },
  '/workspaces/{slug}/screenings': {
    post: {
      summary: 'Screen and save one flight (one billable unit). Body: the screenFlight input plus optional name and aircraft (a type code of the workspace that supplies emission and Mach when absent). Idempotency-Key header supported.',
      permission: 'screenings:create',
      requestBody: screeningInputSchema,
      responses: { '201': '{ id, name, createdAt, input, result }', '200': 'Idempotent replay of the first result', '402': 'Billing blocks new screenings' },
    },
    get: { summary: 'Saved screenings, newest first', permission: 'flights:read', query: { cursor: 'id from nextCursor', limit: '1-200', from: 'YYYY-MM-DD', to: 'YYYY-MM-DD', route: 'text', aircraft: 'type code', minShareAbove: '0-1', maxShareAbove: '0-1' }, responses: { '200': '{ items, nextCursor }' } },
  },
  '/workspaces/{slug}/screenings/{id}': {
    get: { summary: 'One saved screening', permission: 'flights:read', responses: { '200': '{ id, name, createdAt, input, result }' } },
  },
  '/workspaces/{slug}/screenings/{id}/export': {
    get: { summary: 'One saved screening as a download: CSV (headline figures, then one row per segment) or JSON { id, name, createdAt, input, result }', permission: 'flights:read', query: { format: 'csv (default) or json' }, responses: { '200': 'Attachment (text/csv or application/json)' } },
  },
  '/workspaces/{slug}/screenings/preview': {
    post: { summary: 'Screen without saving (not billed, throttled), with the what-if cruise levels; optional whatIf options', permission: 'screenings:create', requestBody: screeningInputSchema, responses: { '200': '{ input, result, levels }' } },
  },
  '/atmosphere': {
    get: { summary: 'ICAO standard atmosphere at a flight level or altitude', query: { flightLevel: 'number', altitudeM: 'geopotential m' }, responses: { '200': '{ temperatureK, pressurePa, densityKgM3, speedOfSoundMs, ... }' } },
  },
  '/tropopause': {
    post: { summary: 'WMO (1957) lapse-rate tropopause of a sounding', requestBody: z.object({ levels: z.array(soundingLevelSchema) }), responses: { '200': '{ tropopause: { altitudeM, temperatureK, pressureHpa } | null }' } },
  },
  '/airports': {
    get: { summary: 'Airport type-ahead by ICAO/IATA code or name (at most 20)', query: { q: 'text', limit: '1-20' }, responses: { '200': '{ items: { icao, iata, name, country, lat, lon }[] }' } },
  },
  '/openapi.json': {
    get: { summary: 'This document', responses: { '200': 'OpenAPI 3.1' } },
  },
};

export function buildOpenApiDocument(): Record<string, unknown> {
  const paths: Record<string, unknown> = {};
  for (const [path, ops] of Object.entries(API_OPERATIONS)) {
    const item: Record<string, unknown> = {};
    for (const [method, op] of Object.entries(ops) as [Method, OperationSpec][]) {
      const params = [...path.matchAll(/\{(\w+)\}/g)].map((m) => ({ name: m[1], in: 'path', required: true, schema: { type: 'string' } }));
      for (const [name, description] of Object.entries(op.query ?? {})) params.push({ name, in: 'query', required: false, schema: { type: 'string' }, description } as never);
      let requestBody: unknown;
      if (op.requestBody && 'multipart' in op.requestBody) {
        requestBody = { required: true, content: { 'multipart/form-data': { schema: { type: 'object', properties: Object.fromEntries(Object.entries(op.requestBody.multipart).map(([k, d]) => [k, { type: 'string', format: 'binary', description: d }])) } } } };
      } else if (op.requestBody) {
        requestBody = { required: true, content: { 'application/json': { schema: schema(op.requestBody as z.ZodType) } } };
      }
      const responses: Record<string, unknown> = {};
      for (const [code, description] of Object.entries({ ...op.responses, ...ERRORS })) {
        responses[code] = Number(code) >= 400 ? { description, content: { 'application/json': { schema: { $ref: '#/components/schemas/Error' } } } } : { description };
      }
      item[method] = {
        summary: op.summary,
        ...(op.permission ? { description: `Needs the workspace permission \`${op.permission}\`.` } : {}),
        parameters: params,
        ...(requestBody ? { requestBody } : {}),
        responses,
      };
    }
    paths[path] = item;
  }
  return {
    openapi: '3.1.0',
    info: { title: 'Tropopass API', version: '1', description: 'Screening estimates of NOx above the tropopause; not a certified inventory or a regulatory method.' },
    servers: [{ url: '/api/v1' }],
    security: [{ bearer: [] }, { session: [] }],
    components: {
      securitySchemes: { bearer: { type: 'http', scheme: 'bearer', description: 'A workspace API key' }, session: { type: 'apiKey', in: 'cookie', name: 'next-auth.session-token' } },
      schemas: {
        Error: {
          type: 'object',
          required: ['error'],
          properties: {
            error: {
              type: 'object',
              required: ['code', 'message'],
              properties: { code: { type: 'string' }, message: { type: 'string' }, fields: { type: 'array', items: { type: 'object', properties: { path: { type: 'string' }, message: { type: 'string' } } } } },
            },
          },
        },
        ScreeningInput: schema(screeningInputSchema),
        CompareCruiseLevelsOptions: schema(compareCruiseLevelsOptionsSchema),
      },
    },
    paths,
  };
}
