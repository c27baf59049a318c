import 'server-only';
import { createRequire } from 'node:module';
import { geoAzimuthalEqualArea, geoCentroid, geoCircle, geoGraticule10, geoInterpolate, geoPath } from 'd3-geo';
import { feature } from 'topojson-client';
import type { Feature, FeatureCollection, Geometry, LineString } from 'geojson';
import type { GeometryCollection, Topology } from 'topojson-specification';

export interface MapPoint {
  lat: number;
  lon: number;
  /** Airport code, or null for a coordinate waypoint. */
  label: string | null;
}

export interface MapSegment {
  lat: number;
  lon: number;
  aboveTropopause: boolean;
}

const WIDTH = 800;
const HEIGHT = 460;
const PAD = 48;
/** A short route is framed as if it were at least this wide (degrees of arc), so coastlines stay legible. */
const MIN_FRAME_RADIUS_DEG = 7;

// The design tokens of tailwind.config.ts.
const STRATO = '#6a3d9a';
const TROPO = '#23867a';
const INK = '#16233b';
const OCEAN = '#eaf0f6';
const LAND = '#e3e3da';
const COAST = '#b9b9ad';
const GRATICULE = '#cfd7e2';

let land: FeatureCollection | null = null;

/** Natural Earth 1:110m countries from the `world-atlas` package, read once from disk (no network). */
function countries(): FeatureCollection {
  if (land) return land;
  const require = createRequire(import.meta.url);
  const topology = require('world-atlas/countries-110m.json') as Topology<{ countries: GeometryCollection }>;
  land = feature(topology, topology.objects.countries) as FeatureCollection;
  return land;
}

type LonLat = [number, number];

/** Runs of consecutive segments on the same side of the tropopause, as great-circle polylines. */
function runsOf(points: readonly MapPoint[], segments: readonly MapSegment[]): { above: boolean; line: LonLat[] }[] {
  if (segments.length === 0) {
    return points.length >= 2 ? [{ above: false, line: points.map((p): LonLat => [p.lon, p.lat]) }] : [];
  }
  const mids = segments.map((s): LonLat => [s.lon, s.lat]);
  const first: LonLat = points.length ? [points[0].lon, points[0].lat] : mids[0];
  const last: LonLat = points.length
    ? [points[points.length - 1].lon, points[points.length - 1].lat]
    : mids[mids.length - 1];
  const runs: { above: boolean; line: LonLat[] }[] = [];
  let current = { above: segments[0].aboveTropopause, line: [first, mids[0]] as LonLat[] };
  for (let i = 1; i < segments.length; i++) {
    if (segments[i].aboveTropopause === current.above) {
      current.line.push(mids[i]);
      continue;
    }
    const boundary = geoInterpolate(mids[i - 1], mids[i])(0.5) as LonLat;
    current.line.push(boundary);
    runs.push(current);
    current = { above: segments[i].aboveTropopause, line: [boundary, mids[i]] };
  }
  current.line.push(last);
  runs.push(current);
  return runs;
}

type Projection = ReturnType<typeof geoAzimuthalEqualArea>;

/**
 * Puts a label on the side of its point away from the route, so its halo never hides the line:
 * opposite the mean direction towards the neighbouring route points, kept inside the frame.
 */
function labelPlacement(
  projection: Projection,
  line: readonly LonLat[],
  at: LonLat,
  xy: [number, number],
): { dx: number; dy: number; anchor: 'start' | 'middle' | 'end' } {
  let vx = 0;
  let vy = 0;
  let nearest = 0;
  let best = Infinity;
  line.forEach((q, i) => {
    const d = Math.abs(q[0] - at[0]) + Math.abs(q[1] - at[1]);
    if (d < best) {
      best = d;
      nearest = i;
    }
  });
  for (const j of [nearest - 3, nearest + 3]) {
    const q = line[Math.max(0, Math.min(line.length - 1, j))];
    const pq = q ? projection(q) : null;
    if (!pq) continue;
    const len = Math.hypot(pq[0] - xy[0], pq[1] - xy[1]);
    if (len > 0) {
      vx += (pq[0] - xy[0]) / len;
      vy += (pq[1] - xy[1]) / len;
    }
  }
  let ux = -vx;
  let uy = -vy;
  const len = Math.hypot(ux, uy);
  if (len < 0.2) {
    ux = -vy;
    uy = vx;
  }
  const n = Math.hypot(ux, uy) || 1;
  ux /= n;
  uy /= n;
  if (xy[0] < 120 && ux < 0) ux = Math.abs(ux);
  if (xy[0] > WIDTH - 120 && ux > 0) ux = -Math.abs(ux);
  if (xy[1] < 40 && uy < 0) uy = Math.abs(uy);
  if (xy[1] > HEIGHT - 40 && uy > 0) uy = -Math.abs(uy);
  const anchor = ux > 0.35 ? 'start' : ux < -0.35 ? 'end' : 'middle';
  return { dx: ux * 14, dy: uy * 22, anchor };
}

/**
 * The route on an azimuthal equal-area projection centred on the route, fitted with padding: polar
 * and transpolar great circles stay readable, unlike on a cylindrical map. Drawn on the server.
 */
export function RouteMap({
  points,
  segments,
  title,
}: {
  points: readonly MapPoint[];
  segments: readonly MapSegment[];
  title: string;
}) {
  const runs = runsOf(points, segments);
  const all: LonLat[] = runs.flatMap((r) => r.line);
  const routeLine: Feature<LineString> = {
    type: 'Feature',
    properties: {},
    geometry: {
      type: 'LineString',
      coordinates:
        all.length >= 2
          ? all
          : [
              [0, 0],
              [0, 0],
            ],
    },
  };
  const centre = geoCentroid(routeLine) as LonLat;
  const frame: Feature<Geometry> = {
    type: 'Feature',
    properties: {},
    geometry: geoCircle().center(centre).radius(MIN_FRAME_RADIUS_DEG)(),
  };
  const projection = geoAzimuthalEqualArea()
    .rotate([-centre[0], -centre[1]])
    .fitExtent(
      [
        [PAD, PAD],
        [WIDTH - PAD, HEIGHT - PAD],
      ],
      { type: 'FeatureCollection', features: [routeLine, frame] },
    )
    .clipExtent([
      [0, 0],
      [WIDTH, HEIGHT],
    ]);
  const path = geoPath(projection).digits(1);
  const labelled = points.filter((p, i) => p.label !== null || i === 0 || i === points.length - 1);
  return (
    <figure>
      <svg
        viewBox={`0 0 ${WIDTH} ${HEIGHT}`}
        role="img"
        aria-label={title}
        className="h-auto w-full rounded-md border border-line"
        data-testid="route-map"
      >
        <title>{title}</title>
        <defs>
          <clipPath id="route-map-frame">
            <rect x="0" y="0" width={WIDTH} height={HEIGHT} />
          </clipPath>
        </defs>
        <g clipPath="url(#route-map-frame)">
          <rect x="0" y="0" width={WIDTH} height={HEIGHT} fill={OCEAN} />
          <path d={path(geoGraticule10()) ?? ''} fill="none" stroke={GRATICULE} strokeWidth={0.6} />
          <path d={path(countries()) ?? ''} fill={LAND} stroke={COAST} strokeWidth={0.6} />
          {runs.map((r, i) => (
            <path
              key={i}
              d={path({ type: 'LineString', coordinates: r.line }) ?? ''}
              fill="none"
              stroke={r.above ? STRATO : TROPO}
              strokeWidth={5}
              strokeLinecap="round"
              strokeLinejoin="round"
              data-above={r.above ? 'true' : 'false'}
            />
          ))}
          {points.map((p, i) => {
            const xy = projection([p.lon, p.lat]);
            if (!xy) return null;
            return (
              <circle
                key={`pt-${i}`}
                cx={xy[0]}
                cy={xy[1]}
                r={p.label ? 7 : 5}
                fill="#ffffff"
                stroke={INK}
                strokeWidth={2.5}
              />
            );
          })}
          {labelled.map((p, i) => {
            const xy = projection([p.lon, p.lat]);
            if (!xy) return null;
            const text = p.label ?? `${p.lat.toFixed(1)}°, ${p.lon.toFixed(1)}°`;
            const place = labelPlacement(projection, all, [p.lon, p.lat], xy);
            return (
              <text
                key={`label-${i}`}
                x={xy[0] + place.dx}
                y={xy[1] + place.dy}
                textAnchor={place.anchor}
                dominantBaseline="middle"
                fontSize={24}
                fontWeight={700}
                fill={INK}
                stroke="#ffffff"
                strokeWidth={6}
                paintOrder="stroke"
              >
                {text}
              </text>
            );
          })}
        </g>
      </svg>
      <figcaption className="mt-2 flex flex-wrap gap-x-5 gap-y-1 text-xs text-ink-soft">
        <span className="inline-flex items-center gap-1.5">
          <span aria-hidden className="inline-block h-1 w-5 rounded bg-strato" /> Above the tropopause
        </span>
        <span className="inline-flex items-center gap-1.5">
          <span aria-hidden className="inline-block h-1 w-5 rounded bg-tropo" /> Below the tropopause
        </span>
        <span>Great circle on an equal-area map centred on the route. Coastlines: Natural Earth 1:110m.</span>
      </figcaption>
    </figure>
  );
}
