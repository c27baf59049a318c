'use client';

import {
  Chart as ChartJS,
  Filler,
  LinearScale,
  LineController,
  LineElement,
  PointElement,
  Tooltip,
  type ChartData,
  type ChartOptions,
  type ScriptableLineSegmentContext,
} from 'chart.js';
import { Line } from 'react-chartjs-2';
import type { ProfileSeries } from '@/components/screening/profile-series';
import { formatNumber } from '@/lib/format';

ChartJS.register(LineController, LineElement, PointElement, LinearScale, Filler, Tooltip);

// The design tokens of tailwind.config.ts: strato above the tropopause, tropo below it.
const STRATO = '#6a3d9a';
const STRATO_FILL = 'rgba(106, 61, 154, 0.28)';
const TROPO = '#23867a';
const TROPOPAUSE = '#9a5a12';
const GRID = '#e4e4dc';
const OVERLAY = '#4a4a44';

interface Props {
  series: ProfileSeries;
  /** Accessible name of the chart. */
  label: string;
  height?: number;
  /** Shared top of the altitude axis, so two profiles can be compared by eye. */
  yMax?: number;
  /** A second flight's cruise drawn over this one (a plain line), such as the plan beside the flown track. */
  overlay?: { series: ProfileSeries; label: string };
}

/** Cruise altitude and tropopause along the route; the part of the cruise above it shaded. */
export function VerticalProfileChart({ series, label, height = 320, yMax, overlay }: Props) {
  const data: ChartData<'line', { x: number; y: number }[]> = {
    datasets: [
      {
        label: 'Cruise',
        data: series.x.map((x, i) => ({ x, y: series.cruise[i] })),
        borderColor: STRATO,
        borderWidth: 2.5,
        pointRadius: 0,
        pointHitRadius: 6,
        fill: { target: 1, above: STRATO_FILL, below: 'rgba(0, 0, 0, 0)' },
        segment: {
          borderColor: (ctx: ScriptableLineSegmentContext) => (series.above[ctx.p0DataIndex] ? STRATO : TROPO),
        },
      },
      {
        label: 'Tropopause',
        data: series.x.map((x, i) => ({ x, y: series.tropopause[i] })),
        borderColor: TROPOPAUSE,
        borderWidth: 1.5,
        borderDash: [6, 4],
        pointRadius: 0,
        pointHitRadius: 6,
        fill: false,
      },
      ...(overlay
        ? [
            {
              label: overlay.label,
              data: overlay.series.x.map((x, i) => ({ x, y: overlay.series.cruise[i] })),
              borderColor: OVERLAY,
              borderWidth: 2,
              pointRadius: 0,
              pointHitRadius: 0,
              fill: false,
            },
          ]
        : []),
    ],
  };
  const top = Math.max(yMax ?? series.maxAltitude, overlay?.series.maxAltitude ?? 0);
  const xEnd = Math.max(
    series.x.length ? series.x[series.x.length - 1] : 0,
    overlay?.series.x.length ? overlay.series.x[overlay.series.x.length - 1] : 0,
  );
  const options: ChartOptions<'line'> = {
    responsive: true,
    maintainAspectRatio: false,
    animation: false,
    parsing: false,
    normalized: true,
    interaction: { mode: 'index', intersect: false, axis: 'x' },
    scales: {
      x: {
        type: 'linear',
        min: 0,
        max: xEnd > 0 ? xEnd : undefined,
        title: { display: true, text: series.distanceLabel },
        ticks: { callback: (v) => formatNumber(Number(v)) },
        grid: { color: GRID },
      },
      y: {
        type: 'linear',
        min: 0,
        suggestedMax: top * 1.08,
        title: { display: true, text: series.altitudeLabel },
        ticks: { callback: (v) => formatNumber(Number(v)) },
        grid: { color: GRID },
      },
    },
    plugins: {
      legend: { display: false },
      tooltip: {
        filter: (item) => item.datasetIndex === 0,
        callbacks: {
          title: (items) => (items.length ? series.titles[series.segment[items[0].dataIndex]] : ''),
          label: (item) => series.tooltips[series.segment[item.dataIndex]] ?? '',
        },
      },
    },
  };
  return (
    <figure>
      <div style={{ height }} className="relative">
        <Line data={data} options={options} aria-label={label} role="img" />
      </div>
      <figcaption className="mt-2 flex flex-wrap gap-x-5 gap-y-1 text-xs text-ink-soft">
        <span className="inline-flex items-center gap-1.5">
          <span aria-hidden className="inline-block h-0.5 w-5 bg-strato" /> Cruise above the tropopause (shaded)
        </span>
        <span className="inline-flex items-center gap-1.5">
          <span aria-hidden className="inline-block h-0.5 w-5 bg-tropo" /> Cruise below the tropopause
        </span>
        <span className="inline-flex items-center gap-1.5">
          <span aria-hidden className="inline-block w-5 border-t-2 border-dashed border-caution" /> Tropopause
        </span>
        {overlay ? (
          <span className="inline-flex items-center gap-1.5">
            <span aria-hidden className="inline-block h-0.5 w-5" style={{ background: OVERLAY }} /> {overlay.label}
          </span>
        ) : null}
      </figcaption>
    </figure>
  );
}
