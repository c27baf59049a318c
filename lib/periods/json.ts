import type { PeriodInfo } from './service';

/** A period as the API shows it, with the links that apply to its state. */
export function periodJson(slug: string, p: PeriodInfo) {
  const base = `/api/v1/workspaces/${slug}/periods/${p.ref}`;
  return {
    ...p,
    links: {
      self: base,
      page: `/w/${slug}/periods/${p.ref}`,
      ...(p.state !== 'open' ? { report: `${base}/report` } : {}),
      ...(p.state === 'signed' ? { auditPack: `${base}/audit-pack` } : {}),
    },
  };
}
