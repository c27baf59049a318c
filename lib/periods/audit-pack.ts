import 'server-only';
import { zipSync, strToU8 } from 'fflate';
import { appUrl } from '@/lib/env';
import { FLEET_CAUTIONS } from '@/lib/fleets/compare';
import { changesCsv, flightPageUrl, sha256Hex } from './audit-csv';
import { getSignedPeriodFiles } from './service';

export const AUDIT_PACK_FILES = {
  report: 'report.pdf',
  flights: 'flights.csv',
  method: 'method-notes.txt',
  changes: 'changes-after-sign-off.csv',
  signOff: 'sign-off.json',
} as const;

function methodNotes(
  periodName: string,
  a: { method: string[]; sources: string[] },
  engineVersions: { engineVersion: string; flights: number }[],
): string {
  const list = (xs: string[]) => xs.map((x) => `- ${x}`).join('\n');
  return [
    `Method notes: ${periodName}`,
    '',
    'Method and assumptions (as recorded when the period was frozen)',
    list(a.method),
    '',
    'Engine versions of the frozen figures',
    list(engineVersions.map((v) => `${v.engineVersion}: ${v.flights} flight${v.flights === 1 ? '' : 's'}`)),
    '',
    'Data and method sources',
    list(a.sources),
    '',
    'Cautions',
    list([...FLEET_CAUTIONS]),
    '',
    `The file ${AUDIT_PACK_FILES.flights} lists every flight in the figures; its SHA-256 is the hash recorded at sign-off (${AUDIT_PACK_FILES.signOff}). Recompute it with any SHA-256 tool over the file's bytes.`,
    '',
  ].join('\r\n');
}

/**
 * The audit pack of a signed period, as one zip: the frozen report PDF, the frozen flights CSV (the
 * bytes the sign-off hash covers), the method notes with their sources, the changes after sign-off
 * and the sign-off record. Files carry the sign-off time, so the same pack downloads byte-identical
 * until something changes after sign-off.
 */
export async function buildAuditPack(
  scope: { workspaceId: number },
  ref: string,
  ctx: { slug: string; workspaceName: string },
): Promise<{ name: string; zip: Uint8Array }> {
  const { info, files, snapshot, changes } = await getSignedPeriodFiles(scope, ref);
  const base = appUrl();
  const signOff = {
    workspace: ctx.workspaceName,
    period: { ref: info.ref, name: info.name, from: info.from, to: info.to, kind: info.kind },
    state: info.state,
    frozenAt: info.frozenAt,
    frozenBy: info.frozenBy,
    signedAt: info.signedAt,
    signedBy: info.signedBy,
    sha256: info.signHash,
    hashOf: AUDIT_PACK_FILES.flights,
    hashMatchesFile: sha256Hex(files.csv) === info.signHash,
    flights: snapshot.flights,
    engineVersions: snapshot.engineVersions,
    targets: snapshot.targets,
    changesAfterSignOff: changes.length,
    caution:
      'Screening estimates for planning and reporting support: not a certified emissions inventory and not a regulatory method.',
  };
  const mtime = new Date(info.signedAt ?? info.frozenAt ?? Date.now());
  const zip = zipSync(
    {
      [AUDIT_PACK_FILES.report]: [new Uint8Array(files.pdf), { level: 0 }],
      [AUDIT_PACK_FILES.flights]: strToU8(files.csv),
      [AUDIT_PACK_FILES.method]: strToU8(methodNotes(info.name, snapshot.assumptions, snapshot.engineVersions)),
      [AUDIT_PACK_FILES.changes]: strToU8(changesCsv(changes, (id) => flightPageUrl(base, ctx.slug, id))),
      [AUDIT_PACK_FILES.signOff]: strToU8(JSON.stringify(signOff, null, 2) + '\n'),
    },
    { mtime, level: 6 },
  );
  return { name: `${ctx.workspaceName} ${info.name} audit pack`, zip };
}
