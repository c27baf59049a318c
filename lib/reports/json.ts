import type { ReportListItem, ReportRecord } from '@/db/reports';

/** A report as the API returns it: its metadata, its summary and the download links. */
export function reportJson(slug: string, r: ReportRecord | ReportListItem) {
  const base = `/api/v1/workspaces/${slug}/reports/${r.id}`;
  return { ...r, links: { self: base, pdf: `${base}/pdf`, csv: `${base}/csv`, send: `${base}/send` } };
}
