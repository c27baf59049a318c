import { describe, expect, it } from 'vitest';
import Papa from 'papaparse';
import { apiRequest, call, makeWorkspace, sessionCookie, useTestDatabase } from '../support/test-db';
import * as screeningsRoute from '@/app/api/v1/workspaces/[slug]/screenings/route';
import * as exportRoute from '@/app/api/v1/workspaces/[slug]/screenings/[id]/export/route';
import { API_OPERATIONS } from '@/lib/api/openapi';
import { db } from '@/db/client';

useTestDatabase();

const FLIGHT = {
  route: { waypoints: [{ airport: 'EGLL' }, { lat: 64.13, lon: -21.94 }, { airport: 'PANC' }] },
  cruise: {
    steps: [
      { fromKm: 0, flightLevel: 350 },
      { fromKm: 3000, flightLevel: 390 },
    ],
  },
  fuelBurnKg: 55_000,
  emission: { eiNoxGPerKg: 15 },
  month: 1,
};

type Saved = {
  id: number;
  result: {
    segments: { startKm: number; lon: number; noxKg: number; aboveTropopause: boolean }[];
    noxTotalKg: number;
    fractionAboveTropopause: number;
    cautions: string[];
  };
};

async function save(slug: string, cookie: string, name: string): Promise<Saved> {
  const r = await call<Saved>(
    screeningsRoute.POST,
    apiRequest('POST', `/api/v1/workspaces/${slug}/screenings`, { cookie, body: { ...FLIGHT, name } }),
    { slug },
  );
  expect(r.status).toBe(201);
  return r.body;
}

async function download(slug: string, id: number, cookie: string, format?: string): Promise<Response> {
  const q = format === undefined ? '' : `?format=${format}`;
  return (
    exportRoute.GET as unknown as (
      req: Request,
      ctx: { params: Promise<{ slug: string; id: string }> },
    ) => Promise<Response>
  )(apiRequest('GET', `/api/v1/workspaces/${slug}/screenings/${id}/export${q}`, { cookie }), {
    params: Promise.resolve({ slug, id: String(id) }),
  });
}

function parseCsv(text: string): string[][] {
  const parsed = Papa.parse<string[]>(text.replace(/^\ufeff/, ''), { skipEmptyLines: false });
  expect(parsed.errors).toEqual([]);
  return parsed.data.filter((row) => !(row.length === 1 && row[0] === ''));
}

describe('GET /workspaces/{slug}/screenings/{id}/export', () => {
  it('CSV: an attachment that parses, a header block of the headline figures and one row per segment', async () => {
    const ws = await makeWorkspace(['viewer']);
    const saved = await save(ws.slug, await sessionCookie(ws.owner.id), 'Polar check');
    const res = await download(ws.slug, saved.id, await sessionCookie(ws.members.viewer.id));
    expect(res.status).toBe(200);
    expect(res.headers.get('content-type')).toMatch(/^text\/csv/);
    expect(res.headers.get('content-disposition')).toMatch(/^attachment; filename="screening-\d+-[a-z0-9-]+\.csv"$/);
    const text = await res.text();
    // RFC 4180 s.2.1: records end in CRLF, and no bare LF appears outside quoted fields here.
    expect(text.endsWith('\r\n')).toBe(true);
    expect(text.replace(/\r\n/g, '')).not.toMatch(/\n/);
    const rows = parseCsv(text);
    const widths = new Set(rows.map((r) => r.length));
    expect(widths.size).toBe(1);
    const value = (label: string) => rows.find((r) => r[0] === label)?.[1];
    expect(value('Screening')).toBe('Polar check');
    expect(Number(value('NOx total (kg NO2)'))).toBeCloseTo(saved.result.noxTotalKg, 3);
    expect(Number(value('Share of NOx above the tropopause'))).toBeCloseTo(saved.result.fractionAboveTropopause, 5);
    expect(rows.filter((r) => r[0] === 'Caution').map((r) => r[1])).toEqual(saved.result.cautions);
    const headerAt = rows.findIndex((r) => r[0] === 'Segment');
    expect(headerAt).toBeGreaterThan(0);
    const segmentRows = rows.slice(headerAt + 1);
    expect(segmentRows).toHaveLength(saved.result.segments.length);
    const header = rows[headerAt];
    const col = (name: string) => header.indexOf(name);
    const noxSum = segmentRows.reduce((s, r) => s + Number(r[col('NOx (kg NO2)')]), 0);
    expect(noxSum).toBeCloseTo(saved.result.noxTotalKg, 1);
    expect(segmentRows.map((r) => r[col('Above tropopause')])).toEqual(
      saved.result.segments.map((s) => (s.aboveTropopause ? 'yes' : 'no')),
    );
    const westward = segmentRows.find((r) => Number(r[col('Longitude (deg)')]) < 0);
    expect(westward?.[col('Longitude (deg)')]).toMatch(/^-\d/);
  });

  it('CSV: a name that a spreadsheet would run as a formula is neutralised, quotes and commas survive', async () => {
    const ws = await makeWorkspace();
    const cookie = await sessionCookie(ws.owner.id);
    const cases: [string, string][] = [
      ['=HYPERLINK("http://example.test","x")', `'=HYPERLINK("http://example.test","x")`],
      ['+1+2', `'+1+2`],
      ['-3+4', `'-3+4`],
      ['@SUM(A1:A2)', `'@SUM(A1:A2)`],
      ['Winter, "north" track', 'Winter, "north" track'],
    ];
    for (const [name, expected] of cases) {
      const saved = await save(ws.slug, cookie, name);
      const text = await (await download(ws.slug, saved.id, cookie, 'csv')).text();
      const rows = parseCsv(text);
      expect(rows.find((r) => r[0] === 'Screening')?.[1]).toBe(expected);
    }
    // The API trims names, so a leading tab or carriage return can only come from stored data.
    const tabbed = await save(ws.slug, cookie, 'to be renamed');
    await db()('screenings').where({ id: tabbed.id }).update({ name: '\tTabbed' });
    const rows = parseCsv(await (await download(ws.slug, tabbed.id, cookie)).text());
    expect(rows.find((r) => r[0] === 'Screening')?.[1]).toBe("'\tTabbed");
  });

  it('JSON: { id, name, createdAt, input, result } as an attachment', async () => {
    const ws = await makeWorkspace();
    const cookie = await sessionCookie(ws.owner.id);
    const saved = await save(ws.slug, cookie, 'As JSON');
    const res = await download(ws.slug, saved.id, cookie, 'json');
    expect(res.status).toBe(200);
    expect(res.headers.get('content-disposition')).toMatch(/^attachment; filename="screening-\d+.*\.json"$/);
    const body = (await res.json()) as Record<string, unknown> & { result: Saved['result'] };
    expect(Object.keys(body).sort()).toEqual(['createdAt', 'id', 'input', 'name', 'result']);
    expect(body.id).toBe(saved.id);
    expect(body.result.noxTotalKg).toBe(saved.result.noxTotalKg);
  });

  it('404 for another workspace and an unknown id, 401 signed out, 422 for an unknown format', async () => {
    const ws = await makeWorkspace();
    const other = await makeWorkspace();
    const saved = await save(ws.slug, await sessionCookie(ws.owner.id), 'Private');
    const otherCookie = await sessionCookie(other.owner.id);
    expect((await download(ws.slug, saved.id, otherCookie)).status).toBe(404);
    expect((await download(other.slug, saved.id, otherCookie)).status).toBe(404);
    expect((await download(ws.slug, 999_999, await sessionCookie(ws.owner.id))).status).toBe(404);
    expect((await download(ws.slug, saved.id, '')).status).toBe(401);
    const bad = await download(ws.slug, saved.id, await sessionCookie(ws.owner.id), 'xlsx');
    expect(bad.status).toBe(422);
    expect(((await bad.json()) as { error: { fields: { path: string }[] } }).error.fields[0].path).toBe('format');
  });

  it('is documented in the OpenAPI operations', () => {
    expect(API_OPERATIONS['/workspaces/{slug}/screenings/{id}/export']?.get?.permission).toBe('flights:read');
  });
});
