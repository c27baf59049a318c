'use client';

import {
  CategoryScale,
  Chart as ChartJS,
  Legend,
  LinearScale,
  LineController,
  LineElement,
  PointElement,
  Tooltip,
  type ChartData,
  type ChartOptions,
} from 'chart.js';
import { Line } from 'react-chartjs-2';
import { formatNumber } from '@/lib/format';
import { FLEET_COLOURS, monthLabel } from '@/lib/fleets/units';

ChartJS.register(LineController, LineElement, PointElement, CategoryScale, LinearScale, Tooltip, Legend);

const GRID = '#e4e4dc';

interface Props {
  months: string[];
  series: { fleetName: string; shareAbove: (number | null)[] }[];
  height?: number;
}

/** Share of NOx above the tropopause per month, one line per fleet; a month without NOx is a gap. */
export function FleetShareChart({ months, series, height = 240 }: Props) {
  const data: ChartData<'line', (number | null)[], string> = {
    labels: months.map(monthLabel),
    datasets: series.map((s, i) => ({
      label: s.fleetName,
      data: s.shareAbove.map((v) => (v === null ? null : v * 100)),
      borderColor: FLEET_COLOURS[i % FLEET_COLOURS.length],
      backgroundColor: FLEET_COLOURS[i % FLEET_COLOURS.length],
      borderWidth: 2,
      pointRadius: 3,
      spanGaps: false,
      tension: 0,
    })),
  };
  const options: ChartOptions<'line'> = {
    responsive: true,
    maintainAspectRatio: false,
    animation: false,
    plugins: {
      legend: { position: 'bottom', labels: { boxWidth: 12 } },
      tooltip: { callbacks: { label: (c) => `${c.dataset.label}: ${formatNumber(Number(c.parsed.y), 1)} %` } },
    },
    scales: {
      x: { grid: { display: false } },
      y: {
        beginAtZero: true,
        suggestedMax: 10,
        grid: { color: GRID },
        title: { display: true, text: '% of NOx above' },
      },
    },
  };
  const summary = series
    .map(
      (s) =>
        `${s.fleetName}: ${s.shareAbove.map((v, i) => `${monthLabel(months[i])} ${v === null ? 'no flights' : `${formatNumber(v * 100, 1)} %`}`).join(', ')}`,
    )
    .join('; ');
  return (
    <div style={{ height }}>
      <Line
        data={data}
        options={options}
        role="img"
        aria-label={`Share of NOx above the tropopause per month and fleet. ${summary}`}
      />
    </div>
  );
}
