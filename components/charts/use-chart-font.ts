'use client';

import { useEffect } from 'react';
import { Chart } from 'chart.js';

/** Chart.js draws on canvas and ignores CSS fonts: give it the body's computed font family. */
export function useChartFont(): void {
  useEffect(() => {
    const family = getComputedStyle(document.body).fontFamily;
    if (family) Chart.defaults.font.family = family;
    Chart.defaults.color = '#3d4a63';
  }, []);
}
