import { idParam, json, readJson, workspaceRoute } from '@/lib/api/handler';
import { sendReport } from '@/lib/reports/send';
import { reportSendSchema } from '@/lib/validation/reports';

/**
 * Queues an e-mail of the report's PDF to up to 20 recipients: 202 `{ id, recipients, status: 'queued' }`;
 * the `report.send` job sends it and the report's `sendHistory` shows sent or failed.
 */
export const POST = workspaceRoute<{ slug: string; id: string }>(
  'reports:send',
  async ({ req, params, member, principal, userId, actorLabel }) => {
    const id = idParam(params.id);
    const body = await readJson(req, reportSendSchema);
    const senderName = principal.kind === 'user' ? principal.user.name || principal.user.email : member.workspace.name;
    const send = await sendReport(
      { workspaceId: member.workspace.id },
      { reportId: id, recipients: body.recipients, note: body.note, sentBy: userId, senderName, actor: actorLabel },
    );
    return json(send, 202);
  },
);
