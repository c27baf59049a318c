'use client';

import { useState } from 'react';
import {
  Chart as ChartJS,
  Legend,
  LinearScale,
  LineElement,
  LogarithmicScale,
  PointElement,
  ScatterController,
  Tooltip,
  type ChartData,
  type ChartOptions,
  type TooltipItem,
} from 'chart.js';
import { Scatter } from 'react-chartjs-2';
import type { UnitSystem } from '@/db/users';
import { useChartFont } from './use-chart-font';
import { M_PER_FT } from '@/lib/units';

ChartJS.register(ScatterController, LineElement, PointElement, LinearScale, LogarithmicScale, Tooltip, Legend);

// Design tokens of tailwind.config.ts: strato above the tropopause, tropo below, the tropopause itself in the caution colour.
const STRATO = '#6a3d9a';
const TROPO = '#23867a';
const TROPOPAUSE = '#9a5a12';
const INK = '#16233b';
const ISA_GREY = '#6b7487';
const GRID = '#e4e4dc';

/** One point of a profile: geopotential altitude (m), pressure (hPa), temperature (K). */
export interface ProfilePoint {
  altitudeM: number;
  pressureHpa: number;
  temperatureK: number;
}

interface Props {
  /** The sounding's levels, completed (altitude and pressure for each) and rising. */
  levels: ProfilePoint[];
  /** The ISA temperature profile over the same heights, for reference. */
  isa: ProfilePoint[];
  tropopause: ProfilePoint | null;
  units: UnitSystem;
}

type Axis = 'altitude' | 'pressure';
type Pt = { x: number; y: number; p: ProfilePoint };

const celsius = (k: number) => k - 273.15;

/**
 * Temperature profile of a sounding against altitude, or against pressure on a reversed log axis,
 * with the WMO tropopause marked and the ISA profile dashed for reference. Levels above the
 * tropopause are drawn in the stratosphere colour, those below in the troposphere colour.
 */
export function SoundingChart({ levels, isa, tropopause, units }: Props) {
  useChartFont();
  const [axis, setAxis] = useState<Axis>('altitude');
  const imperial = units === 'imperial';
  const heightOf = (p: ProfilePoint) =>
    axis === 'pressure' ? p.pressureHpa : imperial ? p.altitudeM / M_PER_FT : p.altitudeM;
  const point = (p: ProfilePoint): Pt => ({ x: celsius(p.temperatureK), y: heightOf(p), p });
  const above = (p: ProfilePoint) => tropopause !== null && p.altitudeM > tropopause.altitudeM;
  const xs = [...levels, ...isa].map((p) => celsius(p.temperatureK));
  const xMin = Math.floor(Math.min(...xs) / 10) * 10;
  const xMax = Math.ceil(Math.max(...xs) / 10) * 10;
  const pressures = levels.map((p) => p.pressureHpa);
  const heightUnit = axis === 'pressure' ? 'hPa' : imperial ? 'ft' : 'm';
  const fmtHeight = (v: number) => `${Math.round(v).toLocaleString('en-GB')} ${heightUnit}`;

  const data: ChartData<'scatter', Pt[]> = {
    datasets: [
      {
        label: 'Sounding',
        data: levels.map(point),
        showLine: true,
        borderColor: INK,
        borderWidth: 2,
        pointRadius: 3.5,
        pointHoverRadius: 6,
        pointBackgroundColor: levels.map((p) => (above(p) ? STRATO : TROPO)),
        pointBorderColor: levels.map((p) => (above(p) ? STRATO : TROPO)),
      },
      {
        label: 'ISA',
        data: isa.map(point),
        showLine: true,
        borderColor: ISA_GREY,
        borderWidth: 1.5,
        borderDash: [2, 4],
        pointRadius: 0,
        pointHitRadius: 4,
      },
      ...(tropopause
        ? [
            {
              label: 'WMO tropopause',
              data: [
                { x: xMin, y: heightOf(tropopause), p: tropopause },
                { x: xMax, y: heightOf(tropopause), p: tropopause },
              ],
              showLine: true,
              borderColor: TROPOPAUSE,
              borderWidth: 2,
              borderDash: [8, 5],
              pointRadius: 0,
              pointHitRadius: 6,
            },
            {
              label: 'Tropopause level',
              data: [point(tropopause)],
              pointStyle: 'rectRot' as const,
              pointRadius: 7,
              pointBackgroundColor: TROPOPAUSE,
              pointBorderColor: '#ffffff',
              pointBorderWidth: 1.5,
            },
          ]
        : []),
    ],
  };

  const options: ChartOptions<'scatter'> = {
    responsive: true,
    maintainAspectRatio: false,
    animation: false,
    interaction: { mode: 'nearest', intersect: false },
    scales: {
      x: {
        type: 'linear',
        min: xMin,
        max: xMax,
        title: { display: true, text: 'Temperature (°C)' },
        grid: { color: GRID },
      },
      y:
        axis === 'pressure'
          ? {
              type: 'logarithmic',
              reverse: true,
              min: Math.min(...pressures) * 0.9,
              max: Math.max(...pressures) * 1.05,
              title: { display: true, text: 'Pressure (hPa, log scale)' },
              grid: { color: GRID },
              ticks: { callback: (v) => String(Math.round(Number(v))) },
            }
          : {
              type: 'linear',
              beginAtZero: true,
              title: { display: true, text: `Altitude (${heightUnit})` },
              grid: { color: GRID },
            },
    },
    plugins: {
      legend: {
        position: 'bottom',
        labels: { usePointStyle: true, filter: (item) => item.text !== 'Tropopause level' },
      },
      tooltip: {
        callbacks: {
          label: (ctx: TooltipItem<'scatter'>) => {
            const p = (ctx.raw as Pt).p;
            const where = ctx.dataset.label === 'Sounding' ? '' : `${ctx.dataset.label}: `;
            const height = imperial
              ? `${Math.round(p.altitudeM / M_PER_FT).toLocaleString('en-GB')} ft`
              : `${Math.round(p.altitudeM).toLocaleString('en-GB')} m`;
            return `${where}${height}, ${p.pressureHpa.toFixed(1)} hPa, ${celsius(p.temperatureK).toFixed(1)} °C (${p.temperatureK.toFixed(1)} K)`;
          },
        },
      },
    },
  };

  const tp = tropopause
    ? `; WMO tropopause at ${fmtHeight(heightOf(tropopause))}, ${celsius(tropopause.temperatureK).toFixed(1)} °C`
    : '; no WMO tropopause found';
  return (
    <div>
      <div
        role="group"
        aria-label="Height axis"
        className="mb-3 inline-flex rounded-md border border-line-strong p-0.5 text-sm"
      >
        {(['altitude', 'pressure'] as const).map((a) => (
          <button
            key={a}
            type="button"
            aria-pressed={axis === a}
            onClick={() => setAxis(a)}
            className={`rounded px-3 py-1 ${axis === a ? 'bg-accent text-white' : 'text-ink-soft hover:bg-paper-sunk'}`}
          >
            {a === 'altitude' ? 'Against altitude' : 'Against pressure'}
          </button>
        ))}
      </div>
      <div className="relative h-[26rem] w-full">
        <Scatter
          data={data}
          options={options}
          role="img"
          aria-label={`Temperature profile of the sounding against ${axis}${tp}. The levels are listed in the table below.`}
        />
      </div>
    </div>
  );
}
