'use client';

import {
  BarController,
  BarElement,
  CategoryScale,
  Chart as ChartJS,
  Legend,
  LinearScale,
  Tooltip,
  type ChartData,
  type ChartOptions,
} from 'chart.js';
import { Bar } from 'react-chartjs-2';
import type { UnitSystem } from '@/db/users';
import { formatNumber } from '@/lib/format';
import { FLEET_COLOURS, massAxisUnit, monthLabel } from '@/lib/fleets/units';

ChartJS.register(BarController, BarElement, CategoryScale, LinearScale, Tooltip, Legend);

const GRID = '#e4e4dc';

interface Props {
  months: string[];
  series: { fleetName: string; noxAboveKg: number[] }[];
  units: UnitSystem;
  stacked?: boolean;
  height?: number;
}

/** NOx above the tropopause per month, one bar per fleet (grouped, or stacked). Values arrive in kg. */
export function FleetNoxChart({ months, series, units, stacked = false, height = 280 }: Props) {
  const max = Math.max(
    0,
    ...(stacked
      ? months.map((_, i) => series.reduce((s, f) => s + f.noxAboveKg[i], 0))
      : series.flatMap((s) => s.noxAboveKg)),
  );
  const axis = massAxisUnit(max, units);
  const data: ChartData<'bar', number[], string> = {
    labels: months.map(monthLabel),
    datasets: series.map((s, i) => ({
      label: s.fleetName,
      data: s.noxAboveKg.map((v) => v * axis.perKg),
      backgroundColor: FLEET_COLOURS[i % FLEET_COLOURS.length],
      borderRadius: 2,
      maxBarThickness: 42,
    })),
  };
  const options: ChartOptions<'bar'> = {
    responsive: true,
    maintainAspectRatio: false,
    animation: false,
    plugins: {
      legend: { position: 'bottom', labels: { boxWidth: 12 } },
      tooltip: {
        callbacks: {
          label: (c) =>
            `${c.dataset.label}: ${formatNumber(Number(c.parsed.y), axis.unit === 't' ? 2 : 0)} ${axis.unit}`,
        },
      },
    },
    scales: {
      x: { stacked, grid: { display: false } },
      y: { stacked, beginAtZero: true, grid: { color: GRID }, title: { display: true, text: `${axis.unit} NO2` } },
    },
  };
  const summary = series
    .map(
      (s) =>
        `${s.fleetName}: ${s.noxAboveKg.map((v, i) => `${monthLabel(months[i])} ${formatNumber(v * axis.perKg, axis.unit === 't' ? 2 : 0)} ${axis.unit}`).join(', ')}`,
    )
    .join('; ');
  return (
    <div style={{ height }}>
      <Bar
        data={data}
        options={options}
        role="img"
        aria-label={`NOx above the tropopause per month and fleet. ${summary}`}
      />
    </div>
  );
}
