import { PDFDocument, StandardFonts, degrees, rgb, type PDFFont, type PDFPage, type RGB } from 'pdf-lib';
import type { UnitSystem } from '@/db/users';
import {
  formatDistance,
  formatMass,
  formatMassRange,
  formatNumber,
  formatPercent,
  KG_PER_LB,
  KM_PER_NM,
} from '@/lib/format';
import { FLEET_COLOURS, engineVersionsText, massAxisUnit, monthLabel, niceTicks } from '@/lib/fleets/units';
import type { CompareRow, FleetContextRow } from '@/lib/fleets/types';
import type { ReportSummary } from './model';
import { toWinAnsi } from './text';
import { COUNT_LABELS } from '@/lib/counts';

const PAGE_W = 595.28;
const PAGE_H = 841.89;
const MARGIN = 48;
const CONTENT_W = PAGE_W - 2 * MARGIN;
const FOOTER_H = 28;

function hex(h: string): RGB {
  const n = Number.parseInt(h.slice(1), 16);
  return rgb(((n >> 16) & 255) / 255, ((n >> 8) & 255) / 255, (n & 255) / 255);
}

const INK = hex('#16233b');
const INK_SOFT = hex('#3d4a63');
const INK_FAINT = hex('#6b7487');
const LINE = hex('#d8d8cf');
const PAPER_SUNK = hex('#ecece6');
const CAUTION = hex('#9a5a12');
const CAUTION_SOFT = hex('#fbf0df');
const STRATO = hex('#6a3d9a');

interface TextOpts {
  size?: number;
  bold?: boolean;
  color?: RGB;
  x?: number;
  width?: number;
  gap?: number;
}

export interface Column {
  label: string;
  width: number;
  align?: 'left' | 'right';
}

/** A page cursor over pdf-lib: wraps text, breaks pages, and draws tables and charts. */
class Writer {
  readonly pages: PDFPage[] = [];
  page!: PDFPage;
  y = 0;
  private readonly charsets: Map<PDFFont, Set<number>>;

  constructor(
    readonly pdf: PDFDocument,
    readonly regular: PDFFont,
    readonly bold: PDFFont,
  ) {
    this.charsets = new Map([
      [regular, new Set(regular.getCharacterSet())],
      [bold, new Set(bold.getCharacterSet())],
    ]);
    this.newPage();
  }

  newPage(): void {
    this.page = this.pdf.addPage([PAGE_W, PAGE_H]);
    this.pages.push(this.page);
    this.y = PAGE_H - MARGIN;
  }

  /** Starts a new page unless `height` more points fit above the footer. */
  ensure(height: number): void {
    if (this.y - height < MARGIN + FOOTER_H) this.newPage();
  }

  font(bold?: boolean): PDFFont {
    return bold ? this.bold : this.regular;
  }

  clean(s: string, font: PDFFont): string {
    return toWinAnsi(s, this.charsets.get(font));
  }

  width(s: string, size: number, bold?: boolean): number {
    const f = this.font(bold);
    return f.widthOfTextAtSize(this.clean(s, f), size);
  }

  wrap(s: string, size: number, width: number, bold?: boolean): string[] {
    const f = this.font(bold);
    const lines: string[] = [];
    for (const para of this.clean(s, f).split('\n')) {
      let line = '';
      for (const word of para.split(/ +/)) {
        const next = line ? `${line} ${word}` : word;
        if (f.widthOfTextAtSize(next, size) <= width || !line) line = next;
        else {
          lines.push(line);
          line = word;
        }
      }
      lines.push(line);
    }
    return lines;
  }

  /** Draws one line at an explicit baseline. */
  at(
    s: string,
    x: number,
    baseline: number,
    o: { size?: number; bold?: boolean; color?: RGB; rotate?: number } = {},
  ): void {
    const f = this.font(o.bold);
    this.page.drawText(this.clean(s, f), {
      x,
      y: baseline,
      size: o.size ?? 9,
      font: f,
      color: o.color ?? INK,
      ...(o.rotate ? { rotate: degrees(o.rotate) } : {}),
    });
  }

  paragraph(s: string, o: TextOpts = {}): void {
    const size = o.size ?? 9;
    const lead = size * 1.35;
    const x = o.x ?? MARGIN;
    for (const line of this.wrap(s, size, o.width ?? CONTENT_W - (x - MARGIN), o.bold)) {
      this.ensure(lead);
      this.at(line, x, this.y - size, { size, bold: o.bold, color: o.color });
      this.y -= lead;
    }
    this.y -= o.gap ?? 4;
  }

  /** A section heading, moved to the next page unless `keepWith` points of its content fit below it. */
  heading(s: string, keepWith = 90): void {
    this.ensure(34 + keepWith);
    this.y -= 8;
    this.at(s, MARGIN, this.y - 12, { size: 12, bold: true });
    this.y -= 18;
    this.page.drawLine({
      start: { x: MARGIN, y: this.y },
      end: { x: MARGIN + CONTENT_W, y: this.y },
      thickness: 0.6,
      color: LINE,
    });
    this.y -= 8;
  }

  bullets(items: string[], size = 8.5): void {
    for (const item of items) {
      const lines = this.wrap(item, size, CONTENT_W - 12);
      const lead = size * 1.35;
      this.ensure(lead * Math.min(lines.length, 3));
      this.at('-', MARGIN + 2, this.y - size, { size, color: INK_SOFT });
      for (const line of lines) {
        this.ensure(lead);
        this.at(line, MARGIN + 12, this.y - size, { size });
        this.y -= lead;
      }
      this.y -= 2;
    }
    this.y -= 2;
  }

  /** A table with a shaded header; `strong` rows are bold and shaded (totals). */
  table(columns: Column[], rows: string[][], o: { size?: number; strong?: ReadonlySet<number> } = {}): void {
    const size = o.size ?? 7.5;
    const rowH = size * 1.9;
    const total = columns.reduce((s, c) => s + c.width, 0);
    const scale = CONTENT_W / total;
    const widths = columns.map((c) => c.width * scale);
    const header = (): void => {
      const lines = columns.map((c, i) => this.wrap(c.label, size, widths[i] - 6, true));
      const h = Math.max(...lines.map((l) => l.length)) * size * 1.2 + 6;
      this.ensure(h + rowH);
      this.page.drawRectangle({ x: MARGIN, y: this.y - h, width: CONTENT_W, height: h, color: PAPER_SUNK });
      let x = MARGIN;
      columns.forEach((c, i) => {
        lines[i].forEach((line, j) => {
          const w = this.width(line, size, true);
          this.at(line, c.align === 'right' ? x + widths[i] - 3 - w : x + 3, this.y - 3 - size - j * size * 1.2, {
            size,
            bold: true,
            color: INK_SOFT,
          });
        });
        x += widths[i];
      });
      this.y -= h;
    };
    header();
    rows.forEach((row, r) => {
      const strong = o.strong?.has(r) ?? false;
      // A cell is never cut: a long one is set a little smaller (down to 80 %), then wrapped, and
      // the row grows to hold it.
      const cells = row.map((cell, i) => {
        const room = widths[i] - 6;
        const natural = this.width(cell, size, strong);
        if (natural <= room) return { size, lines: [cell] };
        const smaller = Math.max(size * 0.8, (size * room) / natural);
        if (this.width(cell, smaller, strong) <= room) return { size: smaller, lines: [cell] };
        return { size: size * 0.8, lines: this.wrap(cell, size * 0.8, room, strong) };
      });
      const lineCount = Math.max(1, ...cells.map((c) => c.lines.length));
      const h = lineCount === 1 ? rowH : rowH + (lineCount - 1) * size * 1.1;
      if (this.y - h < MARGIN + FOOTER_H) {
        this.newPage();
        header();
      }
      if (strong) this.page.drawRectangle({ x: MARGIN, y: this.y - h, width: CONTENT_W, height: h, color: PAPER_SUNK });
      let x = MARGIN;
      cells.forEach((cell, i) => {
        cell.lines.forEach((line, j) => {
          const w = this.width(line, cell.size, strong);
          const baseline = this.y - rowH + size * 0.65 - j * size * 1.1;
          this.at(line, columns[i].align === 'right' ? x + widths[i] - 3 - w : x + 3, baseline, {
            size: cell.size,
            bold: strong,
          });
        });
        x += widths[i];
      });
      this.page.drawLine({
        start: { x: MARGIN, y: this.y - h },
        end: { x: MARGIN + CONTENT_W, y: this.y - h },
        thickness: 0.4,
        color: LINE,
      });
      this.y -= h;
    });
    this.y -= 8;
  }

  /** A shaded box with a title and bullet lines, kept on one page. */
  box(title: string, items: string[], colours: { fill: RGB; edge: RGB }): void {
    const size = 8.5;
    const lead = size * 1.35;
    const wrapped = items.map((i) => this.wrap(i, size, CONTENT_W - 28));
    const h = 14 + 16 + wrapped.reduce((s, l) => s + l.length * lead + 2, 0);
    this.ensure(h + 6);
    this.page.drawRectangle({
      x: MARGIN,
      y: this.y - h,
      width: CONTENT_W,
      height: h,
      color: colours.fill,
      borderColor: colours.edge,
      borderWidth: 0.8,
    });
    this.at(title, MARGIN + 10, this.y - 18, { size: 10, bold: true, color: colours.edge });
    let y = this.y - 30;
    for (const lines of wrapped) {
      this.at('-', MARGIN + 10, y - size, { size, color: INK_SOFT });
      for (const line of lines) {
        this.at(line, MARGIN + 20, y - size, { size });
        y -= lead;
      }
      y -= 2;
    }
    this.y -= h + 10;
  }

  footers(left: string): void {
    const n = this.pages.length;
    this.pages.forEach((p, i) => {
      const f = this.regular;
      const label = this.clean(`page ${i + 1} of ${n}`, f);
      p.drawLine({
        start: { x: MARGIN, y: MARGIN + 12 },
        end: { x: MARGIN + CONTENT_W, y: MARGIN + 12 },
        thickness: 0.4,
        color: LINE,
      });
      p.drawText(this.clean(left, f), { x: MARGIN, y: MARGIN, size: 7, font: f, color: INK_FAINT });
      p.drawText(label, {
        x: MARGIN + CONTENT_W - f.widthOfTextAtSize(label, 7),
        y: MARGIN,
        size: 7,
        font: f,
        color: INK_FAINT,
      });
    });
  }
}

interface ChartSeries {
  name: string;
  colour: RGB;
  values: (number | null)[];
}

function legend(w: Writer, series: ChartSeries[], x0: number, top: number): number {
  let x = x0;
  let y = top;
  for (const s of series) {
    const label = s.name;
    const width = 14 + w.width(label, 7.5) + 14;
    if (x + width > MARGIN + CONTENT_W) {
      x = x0;
      y -= 12;
    }
    w.page.drawRectangle({ x, y: y - 7, width: 9, height: 7, color: s.colour });
    w.at(label, x + 13, y - 7, { size: 7.5, color: INK_SOFT });
    x += width;
  }
  return top - y + 12;
}

interface ChartFrame {
  left: number;
  right: number;
  top: number;
  bottom: number;
  yOf: (v: number) => number;
}

/**
 * A chart's title, value grid with tick labels and rotated unit, for `plotH` points of height;
 * `plainZero` prints the zero tick without decimals.
 */
function chartFrame(
  w: Writer,
  title: string,
  series: ChartSeries[],
  unit: string,
  plotH: number,
  plainZero: boolean,
): ChartFrame {
  w.ensure(plotH + 80);
  w.at(title, MARGIN, w.y - 10, { size: 9.5, bold: true });
  w.y -= 18;
  const left = MARGIN + 46;
  const right = MARGIN + CONTENT_W - 4;
  const top = w.y - 6;
  const bottom = top - plotH;
  const max = Math.max(0, ...series.flatMap((s) => s.values.map((v) => v ?? 0)));
  const ticks = niceTicks(max);
  const yMax = ticks[ticks.length - 1];
  const yOf = (v: number) => bottom + (v / yMax) * plotH;
  for (const t of ticks) {
    const y = yOf(t);
    w.page.drawLine({ start: { x: left, y }, end: { x: right, y }, thickness: 0.3, color: LINE });
    const label = formatNumber(t, (t !== 0 || !plainZero) && yMax < 10 ? 1 : 0);
    w.at(label, left - 4 - w.width(label, 7), y - 2.5, { size: 7, color: INK_SOFT });
  }
  w.at(unit, MARGIN + 6, bottom + plotH / 2 - w.width(unit, 7) / 2, { size: 7, color: INK_SOFT, rotate: 90 });
  return { left, right, top, bottom, yOf };
}

/** The chart's axes over what was drawn, then its legend; moves the writer below it. */
function finishChart(w: Writer, series: ChartSeries[], f: ChartFrame): void {
  w.page.drawLine({
    start: { x: f.left, y: f.bottom },
    end: { x: f.right, y: f.bottom },
    thickness: 0.8,
    color: INK_SOFT,
  });
  w.page.drawLine({ start: { x: f.left, y: f.bottom }, end: { x: f.left, y: f.top }, thickness: 0.8, color: INK_SOFT });
  const used = legend(w, series, f.left, f.bottom - 20);
  w.y = f.bottom - 20 - used - 6;
}

/** Grouped bars per month with axes, ticks, labels and a legend, drawn with pdf-lib's vector operators. */
function barChart(w: Writer, title: string, months: string[], series: ChartSeries[], unit: string): void {
  const f = chartFrame(w, title, series, unit, 150, true);
  const groupW = (f.right - f.left) / Math.max(1, months.length);
  const barW = Math.min(26, (groupW * 0.78) / Math.max(1, series.length));
  months.forEach((m, i) => {
    const gx = f.left + i * groupW + (groupW - barW * series.length) / 2;
    series.forEach((s, j) => {
      const v = s.values[i] ?? 0;
      if (v > 0)
        w.page.drawRectangle({
          x: gx + j * barW,
          y: f.bottom,
          width: barW - 1,
          height: f.yOf(v) - f.bottom,
          color: s.colour,
        });
    });
    const label = monthLabel(m);
    w.at(label, f.left + i * groupW + groupW / 2 - w.width(label, 7) / 2, f.bottom - 11, { size: 7, color: INK_SOFT });
  });
  finishChart(w, series, f);
}

/** Lines per fleet by month (gaps where a month has no NOx), same axes and legend. */
function lineChart(w: Writer, title: string, months: string[], series: ChartSeries[], unit: string): void {
  const f = chartFrame(w, title, series, unit, 120, false);
  const step = (f.right - f.left) / Math.max(1, months.length);
  const xOf = (i: number) => f.left + step * (i + 0.5);
  months.forEach((m, i) => {
    const label = monthLabel(m);
    w.at(label, xOf(i) - w.width(label, 7) / 2, f.bottom - 11, { size: 7, color: INK_SOFT });
  });
  for (const s of series) {
    let prev: { x: number; y: number } | null = null;
    s.values.forEach((v, i) => {
      if (v === null) {
        prev = null;
        return;
      }
      const p = { x: xOf(i), y: f.yOf(v) };
      if (prev) w.page.drawLine({ start: prev, end: p, thickness: 1.4, color: s.colour });
      w.page.drawCircle({ x: p.x, y: p.y, size: 2.2, color: s.colour });
      prev = p;
    });
  }
  finishChart(w, series, f);
}

const pct = (v: number | null, d = 1) => (v === null ? '-' : formatPercent(v, d));

/**
 * Masses in a report: the app's formatting, with fleet-size sums scaled so a table cell stays short
 * (1 kt = 1 000 t = 10^6 kg, 1 Mt = 10^9 kg; a million lb in aviation units).
 */
export function reportMass(kg: number, units: UnitSystem, digits?: number): string {
  if (units === 'imperial') {
    const lb = kg / KG_PER_LB;
    return Math.abs(lb) >= 1e7 ? `${formatNumber(lb / 1e6, 1)} million lb` : formatMass(kg, units, digits);
  }
  if (Math.abs(kg) >= 1e9) return `${formatNumber(kg / 1e9, 2)} Mt`;
  if (Math.abs(kg) >= 1e6) return `${formatNumber(kg / 1e6, 1)} kt`;
  return formatMass(kg, units, digits);
}

/** Distances in a report: a million km (or NM) and more in millions. */
export function reportDistance(km: number, units: UnitSystem): string {
  const v = units === 'imperial' ? km / KM_PER_NM : km;
  const unit = units === 'imperial' ? 'NM' : 'km';
  return Math.abs(v) >= 1e6 ? `${formatNumber(v / 1e6, 1)} million ${unit}` : formatDistance(km, units);
}

/** A low-high band of report masses in the unit of its larger end. */
export function reportMassRange(lowKg: number, highKg: number, units: UnitSystem, separator: string): string {
  const top = Math.max(Math.abs(lowKg), Math.abs(highKg));
  if (units === 'metric' && top >= 1e6) {
    const [div, unit, d] = top >= 1e9 ? [1e9, 'Mt', 2] : [1e6, 'kt', 1];
    return `${formatNumber(lowKg / div, d)}${separator}${formatNumber(highKg / div, d)} ${unit}`;
  }
  if (units === 'imperial' && top / KG_PER_LB >= 1e7)
    return `${formatNumber(lowKg / KG_PER_LB / 1e6, 1)}${separator}${formatNumber(highKg / KG_PER_LB / 1e6, 1)} million lb`;
  return formatMassRange(lowKg, highKg, units, separator);
}

function figureRow(r: CompareRow, units: UnitSystem, label: string): string[] {
  return [
    label,
    formatNumber(r.flights),
    reportDistance(r.distanceKm, units),
    reportMass(r.fuelKg, units),
    reportMass(r.co2Kg, units),
    reportMass(r.noxTotalKg, units),
    reportMass(r.noxAboveKg, units),
    pct(r.shareAbove),
    r.noxAbovePer1000KmKg === null ? '-' : reportMass(r.noxAbovePer1000KmKg, units, 2),
  ];
}

const FIGURE_COLUMNS = (units: UnitSystem): Column[] => [
  { label: 'Fleet', width: 118 },
  { label: 'Flights', width: 44, align: 'right' },
  { label: `Distance (${units === 'imperial' ? 'NM' : 'km'})`, width: 64, align: 'right' },
  { label: 'Fuel', width: 56, align: 'right' },
  { label: 'CO2 (3.16 kg/kg, ICAO CORSIA)', width: 66, align: 'right' },
  { label: 'NOx (as NO2)', width: 56, align: 'right' },
  { label: 'NOx above tropopause', width: 62, align: 'right' },
  { label: 'Share above', width: 46, align: 'right' },
  { label: 'NOx above per 1000 km', width: 58, align: 'right' },
];

function pctChange(v: number): string {
  return `${Math.abs(v) >= 0.01 ? v.toFixed(3) : v.toPrecision(2)} %`;
}

function contextLines(c: FleetContextRow, units: UnitSystem): string[] {
  return c.studies.map((s) =>
    s.applicable && s.columnChangePct
      ? `${s.citation} (${s.altitudeKm[0]}-${s.altitudeKm[1]} km): ${reportMass(s.noxInBandKgPerYear, units)} per year in its band -> global column ozone ${pctChange(s.columnChangePct.central)} (${pctChange(s.columnChangePct.low)} to ${pctChange(s.columnChangePct.high)}, +/-50 %). A fleet-scale model result scaled linearly, not a property of these flights.`
      : `${s.citation} (${s.altitudeKm[0]}-${s.altitudeKm[1]} km): not applicable - no NOx above the tropopause at the altitudes this study covers; it is never extrapolated.`,
  );
}

export interface ReportPdfText {
  method: string[];
  sources: string[];
}

/** The title, what the report covers (workspace, period, fleets, units, engine version) and the caution box. */
function writeTitleBlock(w: Writer, s: ReportSummary): void {
  const units = s.units;
  w.at('Tropopass fleet report', MARGIN, w.y - 9, { size: 9, bold: true, color: STRATO });
  w.y -= 16;
  w.paragraph(s.title, { size: 18, bold: true, gap: 6 });
  const meta: [string, string][] = [
    ['Workspace', s.workspaceName],
    ['Period', `${s.period.from} to ${s.period.to} (${s.period.days} days)`],
    ['Fleets', s.fleets.map((f) => f.name).join(', ') || '-'],
    ['Built', `${s.generatedAt.slice(0, 16).replace('T', ' ')} UTC by ${s.generatedBy}`],
    [
      'Units',
      units === 'imperial' ? 'pounds, nautical miles (aviation units)' : 'kilograms and tonnes, kilometres (metric)',
    ],
    [
      s.engineVersions.length > 1 ? 'Engine versions' : 'Engine version',
      s.engineVersionFlights?.length
        ? `${engineVersionsText(s.engineVersionFlights)}${s.engineVersionFlights.length > 1 ? ' - mixed, see the caution below' : ''}`
        : s.engineVersions.length
          ? s.engineVersions.join(', ')
          : '-',
    ],
  ];
  for (const [k, v] of meta) {
    const lines = w.wrap(v, 9, CONTENT_W - 90);
    w.ensure(lines.length * 12);
    w.at(k, MARGIN, w.y - 9, { size: 9, bold: true, color: INK_SOFT });
    lines.forEach((l, i) => w.at(l, MARGIN + 90, w.y - 9 - i * 12, { size: 9 }));
    w.y -= lines.length * 12 + 1;
  }
  w.y -= 8;
  w.box('Screening estimate - read before use', s.cautions, { fill: CAUTION_SOFT, edge: CAUTION });
}

/** All fleets together: one figure a row. */
function writeTotals(w: Writer, s: ReportSummary): void {
  const units = s.units;
  w.heading('Totals');
  const t = s.totals;
  const totalsRows: string[][] = [
    [COUNT_LABELS.importedFlightsScreened, formatNumber(t.flights)],
    ['Distance flown (cruise track)', reportDistance(t.distanceKm, units)],
    ['Fuel', reportMass(t.fuelKg, units)],
    ['CO2 (3.16 kg per kg fuel, ICAO CORSIA)', reportMass(t.co2Kg, units)],
    ['NOx emitted (as NO2)', reportMass(t.noxTotalKg, units)],
    ['NOx above the tropopause (as NO2)', reportMass(t.noxAboveKg, units)],
    ['Share of NOx above the tropopause', pct(t.shareAbove)],
    [
      'NOx above the tropopause per 1000 km',
      t.noxAbovePer1000KmKg === null ? '-' : reportMass(t.noxAbovePer1000KmKg, units, 2),
    ],
    ['Ozone-loss figure, central (gross)', reportMass(t.ozone.centralKg, units)],
    ['Ozone-loss figure, low-high range', reportMassRange(t.ozone.lowKg, t.ozone.highKg, units, ' to ')],
  ];
  w.table(
    [
      { label: 'Figure', width: 300 },
      { label: 'All fleets in the report', width: 199, align: 'right' },
    ],
    totalsRows,
    { size: 8.5 },
  );
  w.paragraph(s.notes.ratios, { size: 7.5, color: INK_SOFT });
}

/** The figures per fleet with an all-fleets row, then the ozone-loss figure with its range. */
function writePerFleet(w: Writer, s: ReportSummary): void {
  const units = s.units;
  const t = s.totals;
  w.heading('Per fleet', 120);
  const perFleetRows = [...s.perFleet.map((r) => figureRow(r, units, r.fleetName)), figureRow(t, units, 'All fleets')];
  w.table(FIGURE_COLUMNS(units), perFleetRows, { strong: new Set([perFleetRows.length - 1]) });
  const ozoneRows = [...s.perFleet, t].map((r, i) => [
    i === s.perFleet.length ? 'All fleets' : r.fleetName,
    reportMass(r.ozone.centralKg, units),
    reportMass(r.ozone.lowKg, units),
    reportMass(r.ozone.highKg, units),
  ]);
  w.paragraph('Ozone-loss screening figure (gross catalytic loss, not a net column change):', {
    size: 8.5,
    bold: true,
  });
  w.table(
    [
      { label: 'Fleet', width: 200 },
      { label: 'Central', width: 100, align: 'right' },
      { label: 'Low', width: 100, align: 'right' },
      { label: 'High', width: 100, align: 'right' },
    ],
    ozoneRows,
    { strong: new Set([ozoneRows.length - 1]) },
  );
}

/** How sure: 5-95 % of each total from correlated sampling, when the sampling has run. */
function writePercentiles(w: Writer, s: ReportSummary): void {
  const units = s.units;
  const band = s.percentiles;
  if (band) {
    w.paragraph('How sure: 5-95 % of each total from correlated sampling', { size: 8.5, bold: true });
    const range = (b: { p5: number; p95: number }) => reportMassRange(b.p5, b.p95, units, ' to ');
    const nameOf = (id: number | null) =>
      id === null ? 'No fleet' : (s.perFleet.find((r) => r.fleetId === id)?.fleetName ?? String(id));
    const bandRows = [
      ...band.fleets.map((b) => ({ ...b, name: nameOf(b.fleetId) })),
      { ...band.total, name: 'All fleets' },
    ]
      .filter((b, i, all) => i === all.length - 1 || s.perFleet.some((r) => r.fleetId === b.fleetId))
      .map((b) => [b.name, range(b.noxAboveTropopauseKg), range(b.ozoneLossKg)]);
    w.table(
      [
        { label: 'Fleet', width: 200 },
        { label: 'NOx above the tropopause, 5-95 %', width: 150, align: 'right' },
        { label: 'Ozone-loss figure, 5-95 %', width: 149, align: 'right' },
      ],
      bandRows,
      { strong: new Set([bandRows.length - 1]) },
    );
    w.paragraph(
      `${band.note}${band.flightsLeftOut > 0 ? ` ${formatNumber(band.flightsLeftOut)} flights screened by an older engine version are not in the sampling; re-screen their imports to include them.` : ''}`,
      { size: 7.5, color: INK_SOFT },
    );
  }
}

/** The flights accepted with a fuel warning, when there are any. */
function writeFuelWarnings(w: Writer, s: ReportSummary): void {
  const t = s.totals;
  const warned = s.fuelWarnings;
  if (warned && warned.count > 0) {
    w.heading('Flights with unusual fuel');
    w.paragraph(
      `${formatNumber(warned.count)} of the ${formatNumber(t.flights)} flights in this report have a fuel burn that is unusual for their distance (accepted at import with a warning; check them before relying on their figures)${warned.count > warned.items.length ? `; the first ${warned.items.length} are listed` : ''}.`,
      { size: 8.5, color: INK_SOFT },
    );
    w.table(
      [
        { label: 'Date', width: 60 },
        { label: 'Flight', width: 60 },
        { label: 'Route', width: 70 },
        { label: 'Warning', width: 309 },
      ],
      warned.items.map((f) => [f.date, f.flight, `${f.origin}-${f.destination}`, f.warning]),
    );
  }
}

/** Monthly charts (NOx above the tropopause, its share) and the table per fleet and month. */
function writeByMonth(w: Writer, s: ReportSummary): void {
  const units = s.units;
  w.heading('By month', 240);
  const maxMonthly = Math.max(0, ...s.series.flatMap((x) => x.noxAboveKg));
  const axis = massAxisUnit(maxMonthly, units);
  const colours = s.series.map((_, i) => hex(FLEET_COLOURS[i % FLEET_COLOURS.length]));
  barChart(
    w,
    'NOx above the tropopause per month and fleet',
    s.months,
    s.series.map((x, i) => ({
      name: x.fleetName,
      colour: colours[i],
      values: x.noxAboveKg.map((v) => v * axis.perKg),
    })),
    `${axis.unit} NO2`,
  );
  lineChart(
    w,
    'Share of NOx above the tropopause per month and fleet',
    s.months,
    s.series.map((x, i) => ({
      name: x.fleetName,
      colour: colours[i],
      values: x.shareAbove.map((v) => (v === null ? null : v * 100)),
    })),
    '% of NOx',
  );
  const monthRows = s.perFleetMonth.map((r) => [
    r.fleetName,
    r.month ? monthLabel(r.month) : '',
    formatNumber(r.flights),
    reportMass(r.fuelKg, units),
    reportMass(r.noxTotalKg, units),
    reportMass(r.noxAboveKg, units),
    pct(r.shareAbove),
    reportMass(r.ozone.centralKg, units),
  ]);
  if (monthRows.length) {
    w.table(
      [
        { label: 'Fleet', width: 130 },
        { label: 'Month', width: 60 },
        { label: 'Flights', width: 44, align: 'right' },
        { label: 'Fuel', width: 60, align: 'right' },
        { label: 'NOx', width: 56, align: 'right' },
        { label: 'NOx above tropopause', width: 66, align: 'right' },
        { label: 'Share above', width: 50, align: 'right' },
        { label: 'Ozone figure (central)', width: 62, align: 'right' },
      ],
      monthRows,
    );
  } else {
    w.paragraph('No screened flights of these fleets in this period.', { size: 9, color: INK_SOFT });
  }
}

/** Fleet-scale context: annualised NOx above the tropopause against published model studies. */
function writeContext(w: Writer, s: ReportSummary): void {
  const units = s.units;
  w.heading('Fleet-scale context');
  w.paragraph(s.context.method, { size: 8, color: INK_SOFT });
  for (const c of [...s.context.fleets, s.context.total]) {
    w.paragraph(
      `${c.fleetName}: ${reportMass(c.annualNoxAboveKg, units)} NOx above the tropopause per year (annualised)`,
      { size: 8.5, bold: true, gap: 2 },
    );
    w.bullets(contextLines(c, units), 8);
  }
}

/** Renders the stored report summary as a PDF (A4, standard fonts, vector charts). */
export async function renderReportPdf(s: ReportSummary, text: ReportPdfText): Promise<Uint8Array> {
  const pdf = await PDFDocument.create();
  pdf.setTitle(toWinAnsi(s.title));
  pdf.setSubject(toWinAnsi(`Fleet report ${s.period.from} to ${s.period.to}`));
  pdf.setProducer('Tropopass');
  pdf.setCreator('Tropopass');
  pdf.setCreationDate(new Date(s.generatedAt));
  const [regular, bold] = await Promise.all([
    pdf.embedFont(StandardFonts.Helvetica),
    pdf.embedFont(StandardFonts.HelveticaBold),
  ]);
  const w = new Writer(pdf, regular, bold);

  writeTitleBlock(w, s);
  writeTotals(w, s);
  writePerFleet(w, s);
  writePercentiles(w, s);
  writeFuelWarnings(w, s);
  writeByMonth(w, s);
  writeContext(w, s);

  w.heading('Method and assumptions');
  w.bullets(text.method);
  w.heading('Cautions');
  w.bullets(s.cautions);
  w.heading('Data sources');
  w.bullets(text.sources);

  w.footers(`${s.title} - ${s.workspaceName} - screening estimate, not a certified inventory`);
  return pdf.save();
}
