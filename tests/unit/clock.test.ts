import { describe, expect, it } from 'vitest';
import { seededStamp } from '@/lib/clock';

describe('seededStamp', () => {
  const now = new Date('2026-12-03T10:53:00.000Z');
  it('keeps a seeded time that is already past', () => {
    expect(seededStamp('2026-12-02', '20:00', now)).toBe('2026-12-02T20:00:00.000Z');
    expect(seededStamp('2026-12-03', '09:00', now)).toBe('2026-12-03T09:00:00.000Z');
  });
  it('never stamps a demo row later than now: a row dated today at 20:00 seeded at 10:53 gets 10:53', () => {
    expect(seededStamp('2026-12-03', '20:00', now)).toBe('2026-12-03T10:53:00.000Z');
  });
});
