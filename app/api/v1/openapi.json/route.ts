import { buildOpenApiDocument } from '@/lib/api/openapi';

let cached: string | undefined;

export function GET(): Response {
  cached ??= JSON.stringify(buildOpenApiDocument());
  return new Response(cached, {
    headers: { 'content-type': 'application/json', 'cache-control': 'public, max-age=300' },
  });
}
