import 'server-only';
import { z } from 'zod';
import { idParam, json, readJson, workspaceRoute } from '@/lib/api/handler';
import { readUpload } from '@/lib/api/upload';
import { csvRejection, type CsvProblem } from '@/lib/imports/csv';
import type { Permission } from '@/lib/auth/policy';
import { fromZod } from '@/lib/errors';

type Scope = { workspaceId: number };
type Actor = { userId: number | null; actor: string };

/**
 * GET, PATCH and DELETE for one library row (`/{kind}/{id}`): read it (flights:read); change any of
 * its fields, the rest kept, checked against the same schema as a new one (library:write); delete it,
 * 204 (library:write). `view` shapes the row for the answer. Each handler is a workspaceRoute and carries its permission.
 */
export function libraryItemRoutes<Dto, Save>(
  get: (scope: Scope, id: number) => Promise<Dto>,
  saveOf: (row: Dto) => object,
  schema: z.ZodType<Save>,
  update: (scope: Scope, id: number, input: Save, by: Actor) => Promise<Dto>,
  remove: (scope: Scope, id: number, by: Actor) => Promise<void>,
  view: (row: Dto) => unknown = (row) => row,
) {
  type Params = { slug: string; id: string };
  return {
    GET: workspaceRoute<Params>('flights:read', async ({ params, member }) => {
      return json(view(await get({ workspaceId: member.workspace.id }, idParam(params.id))));
    }),
    PATCH: workspaceRoute<Params>('library:write', async ({ req, params, member, userId, actorLabel }) => {
      const scope = { workspaceId: member.workspace.id };
      const id = idParam(params.id);
      const current = await get(scope, id);
      const patch = await readJson(
        req,
        z.record(z.string(), z.unknown(), { error: 'Send a JSON object with the fields to change.' }),
      );
      const parsed = schema.safeParse({ ...saveOf(current), ...patch });
      if (!parsed.success) throw fromZod(parsed.error);
      return json(view(await update(scope, id, parsed.data, { userId, actor: actorLabel })));
    }),
    DELETE: workspaceRoute<Params>('library:write', async ({ params, member, userId, actorLabel }) => {
      await remove({ workspaceId: member.workspace.id }, idParam(params.id), { userId, actor: actorLabel });
      return new Response(null, { status: 204 });
    }),
  };
}

/**
 * POST of a CSV (multipart field `file`, at most `maxBytes`) parsed and saved whole: 201 with what
 * `save` answers and the parser's `warnings`; 422 `{ error, problems, warnings }` by line and column
 * (or "The file has no {noun}." for an empty one), nothing saved.
 */
export function csvUploadRoute<Row>(opts: {
  permission: Permission;
  maxBytes: number;
  noun: string;
  parse: (text: string) => { rows: Row[]; problems: CsvProblem[]; warnings: CsvProblem[] };
  save: (scope: Scope, rows: Row[], by: Actor & { fileName?: string }) => Promise<object>;
}) {
  return workspaceRoute<{ slug: string }>(opts.permission, async ({ req, member, userId, actorLabel }) => {
    const upload = await readUpload(req, { maxBytes: opts.maxBytes });
    const parsed = opts.parse(upload.text);
    if (parsed.problems.length || parsed.rows.length === 0) {
      return csvRejection(
        parsed.problems.length ? parsed.problems : [{ line: 1, column: '', message: `The file has no ${opts.noun}.` }],
        parsed.warnings,
      );
    }
    const by = { userId, actor: actorLabel, fileName: upload.fileName };
    const saved = await opts.save({ workspaceId: member.workspace.id }, parsed.rows, by);
    return json({ ...saved, warnings: parsed.warnings }, 201);
  });
}
