import { describe, expect, it } from 'vitest';
import { cursorPageLinks } from '@/lib/search-params';

describe('cursorPageLinks', () => {
  it('on the first page: an older link that pushes 0 on the trail, no newer link; filters kept in order', () => {
    const l = cursorPageLinks(
      '/w/s/flights',
      { from: '2026-10-01', to: '', fleet: '3' },
      {
        cursor: undefined,
        nextCursor: '2026-10-05~41',
        trail: [],
      },
    );
    expect(l.olderHref).toBe('/w/s/flights?from=2026-10-01&fleet=3&cursor=2026-10-05%7E41&trail=0');
    expect(l.newerHref).toBeNull();
    expect(l.href({})).toBe('/w/s/flights?from=2026-10-01&fleet=3');
  });
  it('deeper: newer goes back to the previous cursor, or to the first page when the trail holds 0', () => {
    const second = cursorPageLinks(
      '/w/s/screenings',
      { sort: 'name' },
      { cursor: '90', nextCursor: null, trail: ['0'] },
    );
    expect(second.olderHref).toBeNull();
    expect(second.newerHref).toBe('/w/s/screenings?sort=name');
    const third = cursorPageLinks('/w/s/screenings', {}, { cursor: '50', nextCursor: '20', trail: ['0', '90'] });
    expect(third.newerHref).toBe('/w/s/screenings?cursor=90&trail=0');
    expect(third.olderHref).toBe('/w/s/screenings?cursor=20&trail=0%2C90%2C50');
  });
});
