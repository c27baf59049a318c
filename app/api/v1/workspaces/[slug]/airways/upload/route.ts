import { csvUploadRoute } from '@/lib/api/library-routes';
import { saveAirways } from '@/db/route-library';
import { parseAirwayCsv } from '@/lib/imports/route-library-csv';
import { ROUTE_LIBRARY_LIMITS } from '@/lib/validation/route-library';

/**
 * Airways from a CSV (`airway, sequence, fix`; multipart field `file`); an airway already in the
 * library is replaced: 201 `{ added, updated, warnings }`; 422 `{ error, problems, warnings }`.
 */
export const POST = csvUploadRoute({
  permission: 'navdata:write',
  maxBytes: ROUTE_LIBRARY_LIMITS.maxBytes,
  noun: 'airways',
  parse: parseAirwayCsv,
  save: saveAirways,
});
