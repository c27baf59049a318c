import { describe, expect, it } from 'vitest';
import { attachmentHeaders } from '@/lib/reports/download';

/** The value of filename* decoded as RFC 8187 says (UTF-8, percent-encoded). */
function extName(header: string): string {
  const m = /filename\*=UTF-8''([^;]+)/.exec(header);
  return m ? decodeURIComponent(m[1]) : '';
}

describe('download headers (RFC 6266 / RFC 8187)', () => {
  it('gives an ASCII fallback and the readable UTF-8 name', () => {
    const h = attachmentHeaders('Polar fleets, autumn 2026 – Ålesund', 'pdf', 'application/pdf');
    expect(h['content-disposition']).toMatch(
      /^attachment; filename="polar-fleets-autumn-2026-alesund\.pdf"; filename\*=UTF-8''/,
    );
    expect(extName(h['content-disposition'])).toBe('Polar fleets, autumn 2026 – Ålesund.pdf');
    expect(h['x-content-type-options']).toBe('nosniff');
  });

  it('strips path separators and control characters and encodes quote-like characters', () => {
    const h = attachmentHeaders('../../etc/passwd "x"\r\nSet-Cookie: a=b (o\'k)*', 'csv', 'text/csv');
    const value = h['content-disposition'];
    expect(value).not.toMatch(/[\r\n]/);
    const ext = /filename\*=UTF-8''([^;]+)/.exec(value)?.[1] ?? '';
    expect(ext).not.toMatch(/['()*"\s]/);
    const name = extName(value);
    expect(name).not.toMatch(/[\\/"\r\n]/);
    expect(name.endsWith('.csv')).toBe(true);
  });
});
