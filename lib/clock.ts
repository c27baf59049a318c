/**
 * "Today" for the product: the real UTC date, unless `DEMO_TODAY=YYYY-MM-DD` pins it (demo and tests),
 * so seeded months and "this month" figures line up deterministically.
 */
export function todayIso(): string {
  const pinned = process.env.DEMO_TODAY;
  if (pinned && /^\d{4}-\d{2}-\d{2}$/.test(pinned)) return pinned;
  return new Date().toISOString().slice(0, 10);
}

/** First and last day (inclusive, YYYY-MM-DD) of the month containing `day`. */
export function monthBounds(day = todayIso()): { from: string; to: string } {
  const [y, m] = day.split('-').map(Number);
  const last = new Date(Date.UTC(y, m, 0)).getUTCDate();
  const mm = String(m).padStart(2, '0');
  return { from: `${y}-${mm}-01`, to: `${y}-${mm}-${String(last).padStart(2, '0')}` };
}

/**
 * A seeded time stamp on `day` at `time` (HH:MM, UTC), but never later than the real now: a demo row
 * dated today must not be stamped hours ahead (the usage ledger and the payment service count by
 * when a unit happened, and a stamp in the future falls outside the period's window until then).
 */
export function seededStamp(day: string, time: string, now: Date = new Date()): string {
  const stamp = `${day}T${time}:00.000Z`;
  const real = now.toISOString();
  return stamp < real ? stamp : real;
}
