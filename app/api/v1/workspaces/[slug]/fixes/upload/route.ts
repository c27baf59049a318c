import { csvUploadRoute } from '@/lib/api/library-routes';
import { saveFixes } from '@/db/route-library';
import { parseFixCsv } from '@/lib/imports/route-library-csv';
import { ROUTE_LIBRARY_LIMITS } from '@/lib/validation/route-library';

/**
 * Fixes from a CSV (`name, lat, lon`, optional `region`; multipart field `file`): 201 `{ added,
 * updated, warnings }`; 422 `{ error, problems, warnings }` by line and column, nothing saved.
 */
export const POST = csvUploadRoute({
  permission: 'navdata:write',
  maxBytes: ROUTE_LIBRARY_LIMITS.maxBytes,
  noun: 'fixes',
  parse: parseFixCsv,
  save: saveFixes,
});
