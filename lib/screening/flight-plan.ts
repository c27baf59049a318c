/**
 * Flight-plan routes: the route of an ICAO flight plan (ICAO Doc 4444 PANS-ATM, Appendix 2, item 15)
 * read into waypoints, a step-climb cruise and speeds. Named points and airways come from the
 * caller's own libraries (the engine ships no navigation database). Nothing is dropped silently:
 * every item that cannot be placed is listed in `unresolved` with its character offset and a reason.
 */
import { findAirport } from './airports';
import { ScreeningInputError } from './errors';
import { EARTH_RADIUS_M, legDistanceKm } from './great-circle';
import { expandTrackInput } from './track';
import {
  SCREENING_LIMITS,
  type FieldProblem,
  type ScreeningInput,
  type WaypointsScreeningInput,
} from '../validation/screening';

/** A named point of the caller's fix library. Degrees (WGS-84); `region` tells same-named points apart. */
export interface FlightPlanFix {
  name: string;
  lat: number;
  lon: number;
  region?: string | null;
}

/** An airway of the caller's library: its designator and its points' names in sequence order. */
export interface FlightPlanAirway {
  name: string;
  fixes: readonly string[];
}

/** Options of `parseFlightPlanRoute`. */
export interface FlightPlanOptions {
  /** Departure aerodrome, ICAO or IATA code: the route's first waypoint. */
  from?: string;
  /** Destination aerodrome, ICAO or IATA code: the route's last waypoint. */
  to?: string;
  /**
   * The workspace's named points, as a list, or its whole library `{ fixes, airways }` (the shape the
   * public contract gives `fixes`: named points and airways together).
   */
  fixes?: readonly FlightPlanFix[] | RouteLibrary;
  /** Airways (the workspace's airway library), expanded through their points. */
  airways?: readonly FlightPlanAirway[];
}

/** A waypoint the parser placed, degrees; `name` is the item (or aerodrome code) it came from. */
export interface FlightPlanWaypoint {
  lat: number;
  lon: number;
  name?: string;
}

/** A speed from `fromKm` (km along the route): Mach, or true airspeed in knots. */
export interface FlightPlanSpeed {
  fromKm: number;
  mach?: number;
  tasKt?: number;
}

/** An item the parser could not place: the text as written, its 0-based character offset, why. */
export interface UnresolvedItem {
  item: string;
  /** 0-based character offset of the item in the text; null for `from`/`to`. */
  position: number | null;
  reason: string;
}

/** How each item of the text was understood, for showing back to the planner. */
export interface FlightPlanItem {
  item: string;
  position: number;
  kind:
    | 'speed-level'
    | 'point'
    | 'coordinates'
    | 'bearing-distance'
    | 'airway'
    | 'direct'
    | 'procedure'
    | 'flight-rules'
    | 'other';
  /** read: understood from the text alone; looked-up: found in a library; not-found; ignored. */
  status: 'read' | 'looked-up' | 'not-found' | 'ignored';
  detail: string;
}

/** Result of `parseFlightPlanRoute`. Distances in km along the great circles between waypoints. */
export interface FlightPlanRoute {
  waypoints: FlightPlanWaypoint[];
  cruise: { steps: { fromKm: number; flightLevel: number }[] };
  speeds: FlightPlanSpeed[];
  unresolved: UnresolvedItem[];
  notes: string[];
  items: FlightPlanItem[];
}

interface Token {
  text: string;
  position: number;
}

interface SpeedLevel {
  speed: { mach?: number; tasKt?: number };
  flightLevel: number | null;
  notes: string[];
}

/** A point of the route before ambiguous names are settled. */
interface PendingPoint {
  token: Token;
  name: string;
  candidates: FlightPlanWaypoint[];
  /** The airway that leads to this point, if any. */
  viaAirway: AirwayEntry | null;
  change: SpeedLevel | null;
  cruiseClimb: string | null;
}

interface AirwayEntry {
  token: Token;
  from: PendingPoint | null;
}

const NM_KM = 1.852;
const DEG = Math.PI / 180;
const MAX_FLIGHT_LEVEL = 660;

const SPEED_LEVEL_RE = /^(N\d{4}|M\d{3}|K\d{4})(F\d{3}|S\d{4}|A\d{3}|M\d{4}|VFR)$/;
const CRUISE_CLIMB_RE = /^(N\d{4}|M\d{3}|K\d{4})(F\d{3}|S\d{4}|A\d{3}|M\d{4})(F\d{3}|S\d{4}|A\d{3}|M\d{4}|PLUS)$/;
const COORD_DEG_RE = /^(\d{2})([NS])(\d{3})([EW])$/;
const COORD_MIN_RE = /^(\d{2})(\d{2})([NS])(\d{3})(\d{2})([EW])$/;
const COORD_SEC_RE = /^(\d{2})(\d{2})(\d{2})([NS])(\d{3})(\d{2})(\d{2})([EW])$/;
const BEARING_RE = /^([A-Z]{2,5})(\d{3})(\d{3})$/;
const NAME_RE = /^[A-Z][A-Z0-9]{1,4}$/;
const PROCEDURE_RE = /^[A-Z]{2,5}\d{1,2}[A-Z]$/;
const AIRWAY_RE = /^[A-Z]{1,3}\d{1,4}[A-Z]?$/;

function parseSpeed(s: string): { mach?: number; tasKt?: number } {
  const n = Number(s.slice(1));
  if (s[0] === 'M') return { mach: n / 100 };
  if (s[0] === 'K') return { tasKt: n / NM_KM };
  return { tasKt: n };
}

/** A level group as a flight level, with a note when it is not already one; null for VFR. */
function parseLevel(s: string, notes: string[]): number | null {
  if (s === 'VFR') {
    notes.push('VFR: no cruising level is given; the level before it is kept.');
    return null;
  }
  const n = Number(s.slice(1));
  switch (s[0]) {
    case 'F':
      return n;
    case 'S': {
      const fl = Math.round((n * 10) / 30.48);
      notes.push(`${s}: standard metric level ${n * 10} m, flown as the nearest flight level FL${fl}.`);
      return fl;
    }
    case 'A':
      notes.push(`${s}: altitude ${n * 100} ft, screened as FL${n} (the altimeter setting is not known).`);
      return n;
    default: {
      const fl = Math.round((n * 10) / 30.48);
      notes.push(
        `${s}: altitude ${n * 10} m, screened as the nearest flight level FL${fl} (the altimeter setting is not known).`,
      );
      return fl;
    }
  }
}

function parseSpeedLevel(text: string): SpeedLevel | string {
  const m = SPEED_LEVEL_RE.exec(text);
  if (m === null) return 'is not a speed and level group such as N0480F350, M084F390 or K0830S1190.';
  const notes: string[] = [];
  const flightLevel = parseLevel(m[2], notes);
  if (flightLevel !== null && (flightLevel < 0 || flightLevel > MAX_FLIGHT_LEVEL)) {
    return `gives FL${flightLevel}, outside the FL0-FL${MAX_FLIGHT_LEVEL} the screening covers.`;
  }
  return { speed: parseSpeed(m[1]), flightLevel, notes };
}

/** Coordinates in the item-15 forms (degrees; degrees and minutes; seconds tolerated) or a reason. */
function parseCoordinates(text: string): { lat: number; lon: number; note?: string } | string | null {
  let latDeg: number;
  let latMin = 0;
  let latSec = 0;
  let lonDeg: number;
  let lonMin = 0;
  let lonSec = 0;
  let ns: string;
  let ew: string;
  let note: string | undefined;
  let m = COORD_DEG_RE.exec(text);
  if (m !== null) {
    latDeg = Number(m[1]);
    ns = m[2];
    lonDeg = Number(m[3]);
    ew = m[4];
  } else if ((m = COORD_MIN_RE.exec(text)) !== null) {
    latDeg = Number(m[1]);
    latMin = Number(m[2]);
    ns = m[3];
    lonDeg = Number(m[4]);
    lonMin = Number(m[5]);
    ew = m[6];
  } else if ((m = COORD_SEC_RE.exec(text)) !== null) {
    latDeg = Number(m[1]);
    latMin = Number(m[2]);
    latSec = Number(m[3]);
    ns = m[4];
    lonDeg = Number(m[5]);
    lonMin = Number(m[6]);
    lonSec = Number(m[7]);
    ew = m[8];
    note = `${text}: coordinates with seconds are not an item-15 form; read as written.`;
  } else return null;
  if (latMin >= 60 || lonMin >= 60 || latSec >= 60 || lonSec >= 60) return 'has minutes or seconds of 60 or more.';
  const lat = latDeg + latMin / 60 + latSec / 3600;
  const lon = lonDeg + lonMin / 60 + lonSec / 3600;
  if (lat > 90) return 'has a latitude beyond 90 degrees.';
  if (lon > 180) return 'has a longitude beyond 180 degrees.';
  return { lat: ns === 'S' ? -lat : lat, lon: ew === 'W' ? -lon : lon, note };
}

/** The point `distanceKm` from (lat, lon) on the initial true course `bearingDeg`, on the mean sphere. */
function destinationPoint(
  lat: number,
  lon: number,
  bearingDeg: number,
  distanceKm: number,
): { lat: number; lon: number } {
  const d = (distanceKm * 1000) / EARTH_RADIUS_M;
  const p1 = lat * DEG;
  const l1 = lon * DEG;
  const b = bearingDeg * DEG;
  const sp2 = Math.sin(p1) * Math.cos(d) + Math.cos(p1) * Math.sin(d) * Math.cos(b);
  const p2 = Math.asin(Math.max(-1, Math.min(1, sp2)));
  const l2 = l1 + Math.atan2(Math.sin(b) * Math.sin(d) * Math.cos(p1), Math.cos(d) - Math.sin(p1) * sp2);
  let lonOut = ((((l2 / DEG + 540) % 360) + 360) % 360) - 180;
  if (lonOut === -180 && lon > 0) lonOut = 180;
  return { lat: p2 / DEG, lon: lonOut };
}

function fmtFl(fl: number): string {
  return `FL${String(fl).padStart(3, '0')}`;
}

/**
 * An item-15 coordinate for a point (degrees), in degrees and minutes (`4620N07805W`), rounded to
 * the nearest minute; whole degrees are written in the short form (`46N078W`).
 */
export function formatFlightPlanCoordinate(lat: number, lon: number): string {
  const part = (v: number, degDigits: number, pos: string, neg: string) => {
    const totalMin = Math.round(Math.abs(v) * 60);
    const deg = Math.floor(totalMin / 60);
    const min = totalMin % 60;
    return {
      deg: String(deg).padStart(degDigits, '0'),
      min: String(min).padStart(2, '0'),
      hemi: v < 0 ? neg : pos,
      whole: min === 0,
    };
  };
  const a = part(lat, 2, 'N', 'S');
  const o = part(lon, 3, 'E', 'W');
  if (a.whole && o.whole) return `${a.deg}${a.hemi}${o.deg}${o.hemi}`;
  return `${a.deg}${a.min}${a.hemi}${o.deg}${o.min}${o.hemi}`;
}

function tokenise(text: string): Token[] {
  const out: Token[] = [];
  const re = /\S+/g;
  let m: RegExpExecArray | null;
  while ((m = re.exec(text)) !== null) out.push({ text: m[0].toUpperCase(), position: m.index });
  return out;
}

function fixIndex(fixes: readonly FlightPlanFix[]): Map<string, FlightPlanWaypoint[]> {
  const byName = new Map<string, FlightPlanWaypoint[]>();
  for (const f of fixes) {
    const name = f.name.trim().toUpperCase();
    const list = byName.get(name);
    const w = { lat: f.lat, lon: f.lon, name };
    if (list === undefined) byName.set(name, [w]);
    else list.push(w);
  }
  return byName;
}

/** What the parse collects as it reads: notes, items that cannot be placed, and every item's reading. */
interface ParseOutput {
  notes: string[];
  unresolved: UnresolvedItem[];
  items: FlightPlanItem[];
}

/** The named points and airways the route is read against, by upper-case name. */
interface RouteLookup {
  fixes: readonly FlightPlanFix[];
  byName: Map<string, FlightPlanWaypoint[]>;
  airwaysByName: Map<string, readonly string[]>;
}

/** The aerodromes at the two ends, as given and as placed. */
interface RouteEnds {
  origin: FlightPlanWaypoint | null;
  destination: FlightPlanWaypoint | null;
  from: string | undefined;
  to: string | undefined;
}

/** Where the first pass stands between items. */
interface ClassifyState {
  points: PendingPoint[];
  pendingAirway: AirwayEntry | null;
  lastWasPoint: boolean;
}

/** One item of the route body and whether it is the first or last. */
interface BodyItem {
  tok: Token;
  isFirst: boolean;
  isLast: boolean;
}

function routeLookupOf(options: FlightPlanOptions): RouteLookup {
  const lib: RouteLibrary = Array.isArray(options.fixes)
    ? { fixes: options.fixes }
    : ((options.fixes as RouteLibrary | undefined) ?? {});
  const byName = fixIndex(lib.fixes ?? []);
  const airwaysByName = new Map<string, readonly string[]>();
  for (const a of [...(lib.airways ?? []), ...(options.airways ?? [])]) {
    airwaysByName.set(
      a.name.trim().toUpperCase(),
      a.fixes.map((f) => f.trim().toUpperCase()),
    );
  }
  return { fixes: lib.fixes ?? [], byName, airwaysByName };
}

/** An aerodrome given beside the route (departure or destination), or null with the reason recorded. */
function routeAirport(
  code: string | undefined,
  role: 'departure' | 'destination',
  unresolved: UnresolvedItem[],
): FlightPlanWaypoint | null {
  if (code === undefined || code.trim() === '') return null;
  const a = findAirport(code);
  if (a === null) {
    unresolved.push({
      item: code.trim().toUpperCase(),
      position: null,
      reason: `The ${role} aerodrome ${code.trim().toUpperCase()} is not a known ICAO or IATA code.`,
    });
    return null;
  }
  return { lat: a.lat, lon: a.lon, name: a.icao ?? a.iata ?? code.trim().toUpperCase() };
}

/** The speed and level group the route begins with, and where the body starts after it. */
function readInitialSpeedLevel(tokens: Token[], out: ParseOutput): { initial: SpeedLevel | null; start: number } {
  if (tokens.length === 0) {
    out.unresolved.push({
      item: '',
      position: 0,
      reason: 'The route is empty: it needs at least a speed and level group.',
    });
    return { initial: null, start: 0 };
  }
  const first = tokens[0];
  const sl = parseSpeedLevel(first.text);
  if (typeof sl !== 'string') {
    out.notes.push(...sl.notes);
    out.items.push({
      item: first.text,
      position: first.position,
      kind: 'speed-level',
      status: 'read',
      detail: describeSpeedLevel(sl),
    });
    return { initial: sl, start: 1 };
  }
  if (/^[NMK]\d/.test(first.text)) {
    out.unresolved.push({ item: first.text, position: first.position, reason: `${first.text} ${sl}` });
    out.items.push({
      item: first.text,
      position: first.position,
      kind: 'speed-level',
      status: 'not-found',
      detail: sl,
    });
    return { initial: null, start: 1 };
  }
  out.unresolved.push({
    item: first.text,
    position: first.position,
    reason:
      'The route must begin with the cruising speed and level, such as N0480F350: none was found, so no level is taken from the text.',
  });
  return { initial: null, start: 0 };
}

/** An airway still waiting for its exit point when something else comes: it cannot be placed. */
function dropPendingAirway(st: ClassifyState, out: ParseOutput): void {
  if (st.pendingAirway === null) return;
  out.unresolved.push({
    item: st.pendingAirway.token.text,
    position: st.pendingAirway.token.position,
    reason: `The airway ${st.pendingAirway.token.text} must be followed by the point where the route leaves it.`,
  });
  markAirway(out.items, st.pendingAirway, 'not-found', 'No exit point follows it.');
  st.pendingAirway = null;
}

/** DCT, a change of flight rules, an aerodrome written at an end, or T for truncated: true when it was one. */
function readMarker(b: BodyItem, st: ClassifyState, ends: RouteEnds, out: ParseOutput): boolean {
  const { tok, isFirst, isLast } = b;
  const t = tok.text;
  if (t === 'DCT') {
    if (isFirst || isLast) {
      out.notes.push(
        `DCT at the ${isFirst ? 'start' : 'end'} of the route is ignored: the route joins the aerodrome directly.`,
      );
      out.items.push({
        item: t,
        position: tok.position,
        kind: 'direct',
        status: 'ignored',
        detail: `Direct at the ${isFirst ? 'start' : 'end'} of the route.`,
      });
    } else {
      out.items.push({
        item: t,
        position: tok.position,
        kind: 'direct',
        status: 'read',
        detail: 'Direct to the next point.',
      });
    }
    dropPendingAirway(st, out);
    st.lastWasPoint = false;
    return true;
  }
  if (t === 'VFR' || t === 'IFR') {
    out.notes.push(
      `${t} at offset ${tok.position}: flight rules change to ${t}; the screening keeps the cruise level and route.`,
    );
    out.items.push({
      item: t,
      position: tok.position,
      kind: 'flight-rules',
      status: 'read',
      detail: `Flight rules change to ${t}.`,
    });
    return true;
  }
  const endAerodrome = isFirst ? ends.origin : isLast ? ends.destination : null;
  if (
    endAerodrome !== null &&
    (t === endAerodrome.name || t === (isFirst ? ends.from : ends.to)?.trim().toUpperCase())
  ) {
    out.notes.push(
      `${t}: the ${isFirst ? 'departure' : 'destination'} aerodrome written in the route is ignored; it is already the ${isFirst ? 'first' : 'last'} point.`,
    );
    out.items.push({
      item: t,
      position: tok.position,
      kind: 'other',
      status: 'ignored',
      detail: `The ${isFirst ? 'departure' : 'destination'} aerodrome.`,
    });
    return true;
  }
  if (t === 'T' && isLast) {
    out.notes.push('T: the route is truncated here; the route continues to the destination as a great circle.');
    out.items.push({ item: t, position: tok.position, kind: 'other', status: 'ignored', detail: 'Truncated route.' });
    return true;
  }
  return false;
}

/**
 * Splits POINT/SPEEDLEVEL and the cruise climb C/POINT/SPEED LEVEL LEVEL|PLUS into the point and its
 * change; null (recorded) when the change cannot be read.
 */
function readChange(
  tok: Token,
  st: ClassifyState,
  out: ParseOutput,
): { pointText: string; changeText: string | null; change: SpeedLevel | null; cruiseClimb: string | null } | null {
  const t = tok.text;
  let pointText = t;
  let changeText: string | null = null;
  let cruiseClimb: string | null = null;
  if (t.startsWith('C/')) {
    const parts = t.split('/');
    const cc = parts.length === 3 ? CRUISE_CLIMB_RE.exec(parts[2]) : null;
    if (cc === null) {
      out.unresolved.push({
        item: t,
        position: tok.position,
        reason: 'A cruise climb is written C/point/speed-level-level, such as C/48N050W/M082F290F350.',
      });
      out.items.push({
        item: t,
        position: tok.position,
        kind: 'other',
        status: 'not-found',
        detail: 'Unreadable cruise climb.',
      });
      st.lastWasPoint = false;
      return null;
    }
    pointText = parts[1];
    changeText = `${cc[1]}${cc[2]}`;
    cruiseClimb = cc[3];
  } else if (t.includes('/')) {
    const slash = t.indexOf('/');
    pointText = t.slice(0, slash);
    changeText = t.slice(slash + 1);
  }

  let change: SpeedLevel | null = null;
  if (changeText !== null) {
    const sl = parseSpeedLevel(changeText);
    if (typeof sl === 'string') {
      out.unresolved.push({ item: t, position: tok.position, reason: `The change ${changeText} ${sl}` });
      out.items.push({
        item: t,
        position: tok.position,
        kind: 'speed-level',
        status: 'not-found',
        detail: `${changeText} ${sl}`,
      });
      st.lastWasPoint = false;
      return null;
    }
    change = sl;
  }
  return { pointText, changeText, change, cruiseClimb };
}

/** Not a point: a procedure at either end, an airway in between, or an item not understood. */
function readNonPoint(b: BodyItem, st: ClassifyState, lookup: RouteLookup, out: ParseOutput): void {
  const { tok, isFirst, isLast } = b;
  const t = tok.text;
  if ((isFirst || isLast) && PROCEDURE_RE.test(t) && !lookup.airwaysByName.has(t) && !lookup.byName.has(t)) {
    const what = isFirst ? 'SID' : 'STAR';
    out.notes.push(
      `${t}: ${what} ignored; the route is taken ${isFirst ? 'from the departure aerodrome to the first point' : 'from the last point to the destination'} as a great circle.`,
    );
    out.items.push({
      item: t,
      position: tok.position,
      kind: 'procedure',
      status: 'ignored',
      detail: `${what}: flown as a great circle.`,
    });
    return;
  }
  if (AIRWAY_RE.test(t) && !isFirst) {
    if (!st.lastWasPoint) {
      out.unresolved.push({
        item: t,
        position: tok.position,
        reason: `The airway ${t} does not follow a point, so where the route joins it is not known.`,
      });
      out.items.push({
        item: t,
        position: tok.position,
        kind: 'airway',
        status: 'not-found',
        detail: 'No point before it.',
      });
      return;
    }
    const lastPoint = st.points.length > 0 ? st.points[st.points.length - 1] : null;
    st.pendingAirway = { token: tok, from: lastPoint };
    out.items.push({ item: t, position: tok.position, kind: 'airway', status: 'read', detail: '' });
    st.lastWasPoint = false;
    return;
  }
  out.unresolved.push({
    item: t,
    position: tok.position,
    reason: `${t} is not a speed/level group, point, coordinate, airway or DCT that the route can read.`,
  });
  out.items.push({ item: t, position: tok.position, kind: 'other', status: 'not-found', detail: 'Not understood.' });
  st.lastWasPoint = false;
}

/** A point (with any change of speed and level), an airway, a procedure or an item not understood. */
function readPointItem(b: BodyItem, st: ClassifyState, lookup: RouteLookup, out: ParseOutput): void {
  const { tok } = b;
  const t = tok.text;
  const split = readChange(tok, st, out);
  if (split === null) return;
  const { pointText, changeText, change, cruiseClimb } = split;
  const point = classifyPoint(pointText, lookup.byName, lookup.airwaysByName, changeText !== null);
  if (point === null) {
    readNonPoint(b, st, lookup, out);
    return;
  }
  if (typeof point === 'string') {
    out.unresolved.push({ item: t, position: tok.position, reason: point });
    out.items.push({ item: t, position: tok.position, kind: 'point', status: 'not-found', detail: point });
    if (st.pendingAirway !== null) {
      out.unresolved.push({
        item: st.pendingAirway.token.text,
        position: st.pendingAirway.token.position,
        reason: `The airway ${st.pendingAirway.token.text} leads to ${pointText}, which cannot be placed.`,
      });
      markAirway(out.items, st.pendingAirway, 'not-found', `Its exit point ${pointText} is not known.`);
      st.pendingAirway = null;
    }
    // A point that cannot be placed still separates items: what follows joins the last known point.
    st.lastWasPoint = false;
    return;
  }
  const pending: PendingPoint = {
    token: tok,
    name: pointText,
    candidates: point.candidates,
    viaAirway: st.pendingAirway,
    change,
    cruiseClimb,
  };
  for (const n of point.notes) out.notes.push(n);
  st.points.push(pending);
  out.items.push({ item: t, position: tok.position, kind: point.kind, status: point.status, detail: point.detail });
  st.pendingAirway = null;
  st.lastWasPoint = true;
}

/** Pass 1: classify every item; points keep their candidates until names are settled. */
function classifyItems(body: Token[], lookup: RouteLookup, ends: RouteEnds, out: ParseOutput): PendingPoint[] {
  const st: ClassifyState = { points: [], pendingAirway: null, lastWasPoint: false };
  for (let k = 0; k < body.length; k++) {
    const b: BodyItem = { tok: body[k], isFirst: k === 0, isLast: k === body.length - 1 };
    if (readMarker(b, st, ends, out)) continue;
    readPointItem(b, st, lookup, out);
  }
  dropPendingAirway(st, out);
  return st.points;
}

/**
 * Pass 2: settle same-named points (shortest detour between neighbours), bearings, airways; each
 * point's cumulative great-circle distance along the placed route.
 */
function placePoints(
  points: PendingPoint[],
  ends: RouteEnds,
  lookup: RouteLookup,
  out: ParseOutput,
): { waypoints: FlightPlanWaypoint[]; placedKm: (number | null)[] } {
  const { origin, destination } = ends;
  const waypoints: FlightPlanWaypoint[] = [];
  if (origin !== null) waypoints.push(origin);
  const placedKm: (number | null)[] = [];
  let cumKm = 0;
  const push = (w: FlightPlanWaypoint) => {
    const prev = waypoints.length > 0 ? waypoints[waypoints.length - 1] : null;
    if (prev !== null) cumKm += legDistanceKm(prev.lat, prev.lon, w.lat, w.lon);
    waypoints.push(w);
  };
  for (let i = 0; i < points.length; i++) {
    const p = points[i];
    const prev = waypoints.length > 0 ? waypoints[waypoints.length - 1] : null;
    let chosen: FlightPlanWaypoint;
    if (p.candidates.length === 1) chosen = p.candidates[0];
    else {
      const next = nextAnchor(points, i + 1) ?? destination;
      chosen = nearestAlong(p.candidates, prev, next);
      const regions = lookup.fixes
        .filter((f) => f.name.trim().toUpperCase() === p.name && f.lat === chosen.lat && f.lon === chosen.lon)
        .map((f) => f.region)
        .find((r) => r !== undefined && r !== null && r !== '');
      out.notes.push(
        `${p.name}: ${p.candidates.length} points in the fix library have this name; the one at ${formatFlightPlanCoordinate(chosen.lat, chosen.lon)}${regions ? ` (${regions})` : ''} is nearest along the route.`,
      );
    }
    if (p.viaAirway !== null) {
      const via = expandAirway(
        p.viaAirway,
        p,
        lookup.byName,
        lookup.airwaysByName,
        waypoints.length > 0 ? waypoints[waypoints.length - 1] : null,
      );
      out.notes.push(via.note);
      markAirway(out.items, p.viaAirway, via.points.length > 0 || via.onAirway ? 'looked-up' : 'read', via.note);
      for (const w of via.points) push(w);
    }
    push(chosen);
    placedKm[i] = cumKm;
  }
  if (destination !== null) push(destination);
  return { waypoints, placedKm };
}

/** Steps and speeds at the cumulative great-circle distance of their point. */
function stepsAndSpeeds(
  points: PendingPoint[],
  placedKm: (number | null)[],
  initial: SpeedLevel | null,
  notes: string[],
): { steps: { fromKm: number; flightLevel: number }[]; speeds: FlightPlanSpeed[] } {
  const steps: { fromKm: number; flightLevel: number }[] = [];
  const speeds: FlightPlanSpeed[] = [];
  const addStep = (fromKm: number, fl: number) => {
    const last = steps.length > 0 ? steps[steps.length - 1] : null;
    if (last !== null && fromKm <= last.fromKm) {
      last.flightLevel = fl;
      if (steps.length > 1 && steps[steps.length - 2].flightLevel === fl) steps.pop();
      return;
    }
    if (last !== null && last.flightLevel === fl) return;
    steps.push({ fromKm, flightLevel: fl });
  };
  const addSpeed = (fromKm: number, s: { mach?: number; tasKt?: number }) => {
    const last = speeds.length > 0 ? speeds[speeds.length - 1] : null;
    if (last !== null && fromKm <= last.fromKm) speeds.pop();
    speeds.push({ fromKm, ...s });
  };
  if (initial !== null) {
    if (initial.flightLevel !== null) addStep(0, initial.flightLevel);
    addSpeed(0, initial.speed);
  }
  for (let i = 0; i < points.length; i++) {
    const p = points[i];
    const km = placedKm[i] ?? 0;
    if (p.change === null) continue;
    for (const n of p.change.notes) notes.push(n);
    if (p.change.flightLevel !== null) {
      if (steps.length === 0 && km > 0) {
        notes.push(
          `${p.name}: the first level in the text is at ${km.toFixed(0)} km; it is used from the start of the route.`,
        );
        addStep(0, p.change.flightLevel);
      } else addStep(km, p.change.flightLevel);
    }
    addSpeed(km, p.change.speed);
    if (p.cruiseClimb !== null) {
      const end = p.cruiseClimb === 'PLUS' ? 'an unstated level above' : fmtFl(parseLevel(p.cruiseClimb, []) ?? 0);
      notes.push(
        `${p.token.text}: cruise climb from ${p.name} to ${end}, screened at ${p.change.flightLevel !== null ? fmtFl(p.change.flightLevel) : 'the level before'}.`,
      );
    }
  }
  return { steps, speeds };
}

/**
 * Reads the route of an ICAO flight plan (Doc 4444 Appendix 2, item 15) into waypoints, a step-climb
 * cruise and speeds.
 *
 * Understood: the initial speed/level group and changes at a point (`POINT/N0480F350`; N knots,
 * M Mach, K km/h; F flight level, S standard metric level in tens of metres, A altitude in hundreds of
 * feet, M altitude in tens of metres, the metric and altitude forms screened at the nearest flight
 * level with a note); cruise climbs (`C/POINT/M082F290F350`, flown at the first level with a note);
 * `VFR`/`IFR` (noted); `DCT`; coordinates (`46N078W`, `4620N07805W`, and seconds with a note); a
 * bearing (magnetic, applied as true with a note) and distance in NM from a known point
 * (`DUB180040`); named points from `fixes` (same-named points: the one making the shortest detour
 * between its neighbours, with a note); airways between two points, through `airways` where the
 * library has the airway and both points, otherwise a great circle with a note; SID and STAR
 * designators and `DCT` at either end (ignored with a note); `T` (truncated route, noted).
 *
 * `from`/`to` (ICAO or IATA) are the first and last waypoints. Level changes become steps at the
 * cumulative great-circle distance (km, mean sphere, as the screening measures it) of their point;
 * the initial level starts at 0 km. Items that cannot be placed are in `unresolved` with their
 * 0-based character offset and a reason; this function never throws on text.
 */
export function parseFlightPlanRoute(text: string, options: FlightPlanOptions = {}): FlightPlanRoute {
  const out: ParseOutput = { notes: [], unresolved: [], items: [] };
  const lookup = routeLookupOf(options);
  const tokens = tokenise(typeof text === 'string' ? text : '');
  const ends: RouteEnds = {
    origin: routeAirport(options.from, 'departure', out.unresolved),
    destination: routeAirport(options.to, 'destination', out.unresolved),
    from: options.from,
    to: options.to,
  };
  const { initial, start } = readInitialSpeedLevel(tokens, out);
  const points = classifyItems(tokens.slice(start), lookup, ends, out);
  const { waypoints, placedKm } = placePoints(points, ends, lookup, out);
  const { steps, speeds } = stepsAndSpeeds(points, placedKm, initial, out.notes);
  return { waypoints, cruise: { steps }, speeds, unresolved: out.unresolved, notes: out.notes, items: out.items };
}

function describeSpeedLevel(sl: SpeedLevel): string {
  const speed =
    sl.speed.mach !== undefined ? `Mach ${sl.speed.mach.toFixed(2)}` : `${Math.round(sl.speed.tasKt ?? 0)} kt`;
  return sl.flightLevel === null ? `${speed}, VFR` : `${speed} at ${fmtFl(sl.flightLevel)}`;
}

function markAirway(
  items: FlightPlanItem[],
  airway: AirwayEntry,
  status: FlightPlanItem['status'],
  detail: string,
): void {
  const it = items.find((x) => x.position === airway.token.position && x.kind === 'airway');
  if (it !== undefined) {
    it.status = status;
    it.detail = detail;
  }
}

interface ClassifiedPoint {
  candidates: FlightPlanWaypoint[];
  kind: FlightPlanItem['kind'];
  status: FlightPlanItem['status'];
  detail: string;
  notes: string[];
}

/** A significant point: its candidates, a reason it cannot be placed, or null when it is no point. */
function classifyPoint(
  t: string,
  byName: Map<string, FlightPlanWaypoint[]>,
  airways: Map<string, readonly string[]>,
  hasChange: boolean,
): ClassifiedPoint | string | null {
  const named = byName.get(t);
  if (named !== undefined) {
    return {
      candidates: named,
      kind: 'point',
      status: 'looked-up',
      detail: `Found in the fix library${named.length > 1 ? ` (${named.length} with this name)` : ''}.`,
      notes: [],
    };
  }
  const c = parseCoordinates(t);
  if (typeof c === 'string') return `${t} ${c}`;
  if (c !== null) {
    return {
      candidates: [{ lat: c.lat, lon: c.lon, name: t }],
      kind: 'coordinates',
      status: 'read',
      detail: `${c.lat.toFixed(4)}, ${c.lon.toFixed(4)}`,
      notes: c.note ? [c.note] : [],
    };
  }
  const b = BEARING_RE.exec(t);
  if (b !== null) {
    const base = byName.get(b[1]);
    if (base === undefined)
      return `${b[1]} is not in the fix library, so ${t} (bearing ${b[2]}, ${Number(b[3])} NM from it) cannot be placed.`;
    const bearing = Number(b[2]);
    if (bearing > 360) return `${t}: the bearing ${b[2]} is beyond 360 degrees.`;
    const origin = base[0];
    const p = destinationPoint(origin.lat, origin.lon, bearing, Number(b[3]) * NM_KM);
    return {
      candidates: [{ lat: p.lat, lon: p.lon, name: t }],
      kind: 'bearing-distance',
      status: 'looked-up',
      detail: `${Number(b[3])} NM from ${b[1]} on ${b[2]} degrees.`,
      notes: [
        `${t}: ${Number(b[3])} NM from ${b[1]} on bearing ${b[2]}; the bearing is magnetic in a flight plan and is applied as true (magnetic variation is not known).${base.length > 1 ? ` ${b[1]} has ${base.length} entries in the fix library; the first is used.` : ''}`,
      ],
    };
  }
  if (airways.has(t) && !hasChange) return null;
  if (NAME_RE.test(t) && !/\d/.test(t)) return `${t} is not in the fix library.`;
  return null;
}

/** The first point after index `from` whose position is certain (one candidate). */
function nextAnchor(points: readonly PendingPoint[], from: number): FlightPlanWaypoint | null {
  for (let i = from; i < points.length; i++) if (points[i].candidates.length === 1) return points[i].candidates[0];
  return null;
}

/** The candidate with the shortest path prev -> candidate -> next (either end may be missing). */
function nearestAlong(
  candidates: readonly FlightPlanWaypoint[],
  prev: FlightPlanWaypoint | null,
  next: FlightPlanWaypoint | null,
): FlightPlanWaypoint {
  let best = candidates[0];
  let bestKm = Infinity;
  for (const c of candidates) {
    let km = 0;
    if (prev !== null) km += legDistanceKm(prev.lat, prev.lon, c.lat, c.lon);
    if (next !== null) km += legDistanceKm(c.lat, c.lon, next.lat, next.lon);
    if (km < bestKm) {
      bestKm = km;
      best = c;
    }
  }
  return best;
}

/** The intermediate points of an airway between its entry and exit, or a great circle with a note. */
function expandAirway(
  airway: AirwayEntry,
  exit: PendingPoint,
  byName: Map<string, FlightPlanWaypoint[]>,
  airways: Map<string, readonly string[]>,
  prev: FlightPlanWaypoint | null,
): { points: FlightPlanWaypoint[]; note: string; onAirway: boolean } {
  const name = airway.token.text;
  const entry = airway.from?.name ?? '?';
  const seq = airways.get(name);
  if (seq === undefined) {
    return {
      points: [],
      onAirway: false,
      note: `${name}: not in the airway library; flown as a great circle from ${entry} to ${exit.name}.`,
    };
  }
  const i = seq.indexOf(entry);
  const j = seq.indexOf(exit.name);
  if (i < 0 || j < 0 || i === j) {
    const missing = [i < 0 ? entry : null, j < 0 ? exit.name : null].filter((x) => x !== null).join(' and ');
    return {
      points: [],
      onAirway: false,
      note: `${name}: ${missing ? `${missing} ${missing.includes(' and ') ? 'are' : 'is'} not on this airway in the library` : 'enters and leaves at the same point'}; flown as a great circle from ${entry} to ${exit.name}.`,
    };
  }
  const names = i < j ? seq.slice(i + 1, j) : seq.slice(j + 1, i).reverse();
  const out: FlightPlanWaypoint[] = [];
  const missing: string[] = [];
  let last = prev;
  for (const n of names) {
    const cands = byName.get(n);
    if (cands === undefined) {
      missing.push(n);
      continue;
    }
    const w = cands.length === 1 ? cands[0] : nearestAlong(cands, last, null);
    out.push(w);
    last = w;
  }
  const via =
    names.length === 0 ? 'no points between them' : `${out.length} point${out.length === 1 ? '' : 's'} between them`;
  return {
    points: out,
    onAirway: true,
    note: `${name}: expanded through the airway library from ${entry} to ${exit.name} (${via})${missing.length > 0 ? `; ${missing.join(', ')} not in the fix library and skipped` : ''}.`,
  };
}

/** The caller's named points and airways (a workspace's fix and airway libraries). */
export interface RouteLibrary {
  fixes?: readonly FlightPlanFix[];
  airways?: readonly FlightPlanAirway[];
}

/** What the screening understood of a flight-plan route (kept on the result). */
export interface FlightPlanUsed extends FlightPlanRoute {
  text: string;
  from: string;
  to: string;
  /** True when the text's levels were flown instead of the entered cruise. */
  levelsFromText: boolean;
}

/**
 * A screening input with a flight-plan route turned into the waypoints form: the parsed waypoints,
 * and the text's levels as the cruise when it has any (the entered `cruise` otherwise). Inputs
 * already given as waypoints come back unchanged, and tracks as their waypoints and steps, with
 * `flightPlan: null`. Throws ScreeningInputError
 * at `route.flightPlan.*` when the aerodromes are unknown or the text leaves fewer than 2 points,
 * more than 500 waypoints or more than 50 level changes.
 */
export function expandFlightPlanInput(
  input: ScreeningInput,
  library: RouteLibrary = {},
): { input: WaypointsScreeningInput; flightPlan: FlightPlanUsed | null } {
  const route = input.route;
  if ('waypoints' in route) return { input: { ...input, route }, flightPlan: null };
  if ('track' in route) return { input: expandTrackInput({ ...input, route }).input, flightPlan: null };
  const { text, from, to } = route.flightPlan;
  const parsed = parseFlightPlanRoute(text, { from, to, fixes: library.fixes, airways: library.airways });
  const problems: FieldProblem[] = [];
  for (const [field, code, role] of [
    ['from', from, 'departure'],
    ['to', to, 'destination'],
  ] as const) {
    if (findAirport(code) === null) {
      problems.push({
        path: `route.flightPlan.${field}`,
        message: `No ${role} aerodrome with the code ${code.toUpperCase()} is known: check the ICAO or IATA code.`,
      });
    }
  }
  if (problems.length === 0 && parsed.waypoints.length < SCREENING_LIMITS.minWaypoints) {
    problems.push({ path: 'route.flightPlan.text', message: 'The flight plan gives no route that can be placed.' });
  }
  if (parsed.waypoints.length > SCREENING_LIMITS.maxWaypoints) {
    problems.push({
      path: 'route.flightPlan.text',
      message: `The flight plan expands to ${parsed.waypoints.length} waypoints; a route may have at most ${SCREENING_LIMITS.maxWaypoints}.`,
    });
  }
  if (parsed.cruise.steps.length > SCREENING_LIMITS.maxSteps) {
    problems.push({
      path: 'route.flightPlan.text',
      message: `The flight plan has ${parsed.cruise.steps.length} level changes; a screening takes at most ${SCREENING_LIMITS.maxSteps}.`,
    });
  }
  if (problems.length > 0) throw new ScreeningInputError(problems);
  const steps = parsed.cruise.steps;
  const levelsFromText = steps.length > 0;
  const cruise = !levelsFromText
    ? input.cruise
    : steps.length === 1
      ? { flightLevel: steps[0].flightLevel }
      : { steps: steps.map((st) => ({ ...st })) };
  return {
    input: { ...input, route: { waypoints: parsed.waypoints.map((w) => ({ lat: w.lat, lon: w.lon })) }, cruise },
    flightPlan: { ...parsed, text, from: from.toUpperCase(), to: to.toUpperCase(), levelsFromText },
  };
}

/**
 * A saved flight-plan screening's input as it was screened: the route read then (waypoints) and,
 * when the text had levels, its steps. Re-working it (what-if levels) then does not depend on later
 * changes to the fix library. Inputs of other route forms come back unchanged.
 */
export function inputAsScreened(input: ScreeningInput, flightPlan: FlightPlanUsed | undefined): ScreeningInput {
  if (!('flightPlan' in input.route) || flightPlan === undefined || flightPlan.waypoints.length < 2) return input;
  const steps = flightPlan.cruise.steps;
  return {
    ...input,
    route: { waypoints: flightPlan.waypoints.map((w) => ({ lat: w.lat, lon: w.lon })) },
    cruise:
      flightPlan.levelsFromText && steps.length > 0
        ? steps.length === 1
          ? { flightLevel: steps[0].flightLevel }
          : { steps }
        : input.cruise,
  };
}
