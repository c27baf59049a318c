import { describe, expect, it } from 'vitest';
import { PDFDocument, StandardFonts } from 'pdf-lib';
import { fileStem, isWinAnsi, toWinAnsi } from '@/lib/reports/text';

describe('WinAnsi text for the standard PDF fonts', () => {
  it.each([
    ['arrow', 'EGLL → KSFO', 'EGLL -> KSFO'],
    ['subscripts', 'NO₂ and CO₂', 'NO2 and CO2'],
    ['comparison signs', '≤ FL410 ≥', '<= FL410 >='],
    ['narrow no-break space', '1\u202f000', '1 000'],
    ['kept: en dash, curly quotes, degree, micro', '– “x” 5 °C µm', '– “x” 5 °C µm'],
    ['accent outside WinAnsi loses the accent', 'Łódź Kraków', 'Lódz Kraków'],
    ['unknown script becomes ?', 'Flug 東京', 'Flug ??'],
    ['control characters dropped', 'a\u0007b', 'ab'],
  ])('%s', (_label, input, expected) => {
    expect(toWinAnsi(input)).toBe(expected);
  });

  it('everything it returns can be encoded by Helvetica (pdf-lib throws otherwise)', async () => {
    const pdf = await PDFDocument.create();
    const font = await pdf.embedFont(StandardFonts.Helvetica);
    const charset = new Set(font.getCharacterSet());
    const nasty = 'Δ NOₓ → ≈ 10⁻⁶ ☃ 😀 Ωmega “ok” € Š œ Ÿ ‰';
    expect(() => font.encodeText(nasty)).toThrow();
    const safe = toWinAnsi(nasty, charset);
    expect(() => font.encodeText(safe)).not.toThrow();
    for (const ch of safe) expect(isWinAnsi(ch.codePointAt(0) ?? 0)).toBe(true);
  });

  it('file stems are ASCII and never empty', () => {
    expect(fileStem('Q4 polar fleets (draft) – Ålesund')).toBe('q4-polar-fleets-draft-alesund');
    expect(fileStem('東京')).toBe('report');
  });
});
