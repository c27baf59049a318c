/**
 * The PDF's standard fonts encode WinAnsi (Windows-1252) only. Text is first given plain equivalents
 * for the characters we are likely to meet (arrows, subscripts, math signs, exotic spaces), then
 * anything the font still cannot encode becomes "?".
 */
const REPLACEMENTS: Record<string, string> = {
  '→': '->',
  '←': '<-',
  '↔': '<->',
  '≤': '<=',
  '≥': '>=',
  '≈': '~',
  '−': '-',
  '‐': '-',
  '‑': '-',
  '‒': '-',
  '\u00a0': ' ',
  '\u2009': ' ',
  '\u202f': ' ',
  '\u2007': ' ',
  '\u200b': '',
  '\t': ' ',
  '₀': '0',
  '₁': '1',
  '₂': '2',
  '₃': '3',
  '₄': '4',
  '₅': '5',
  '₆': '6',
  '₇': '7',
  '₈': '8',
  '₉': '9',
  '⁰': '0',
  '⁴': '4',
  '⁵': '5',
  '⁶': '6',
  '⁷': '7',
  '⁸': '8',
  '⁹': '9',
  '⁻': '-',
  Ł: 'L',
  ł: 'l',
  Đ: 'D',
  đ: 'd',
  ı: 'i',
  '✓': 'yes',
  '✗': 'no',
};

/** Windows-1252 code points above 0x7f that are not Latin-1 (0x80-0x9f block). */
const CP1252_EXTRA = new Set([
  0x20ac, 0x201a, 0x0192, 0x201e, 0x2026, 0x2020, 0x2021, 0x02c6, 0x2030, 0x0160, 0x2039, 0x0152, 0x017d, 0x2018,
  0x2019, 0x201c, 0x201d, 0x2022, 0x2013, 0x2014, 0x02dc, 0x2122, 0x0161, 0x203a, 0x0153, 0x017e, 0x0178,
]);

/** True when Windows-1252 (the standard fonts' WinAnsi encoding) has this code point. */
export function isWinAnsi(cp: number): boolean {
  if (cp === 0x0a) return true;
  if (cp >= 0x20 && cp <= 0x7e) return true;
  if (cp >= 0xa0 && cp <= 0xff) return true;
  return CP1252_EXTRA.has(cp);
}

/**
 * Text the standard PDF fonts can draw: plain equivalents first, then "?" for the rest; control
 * characters other than a new line are dropped. Pass the font's own character set to be exact.
 */
export function toWinAnsi(text: string, charset?: ReadonlySet<number>): string {
  let out = '';
  for (const ch of text.normalize('NFC')) {
    const mapped = REPLACEMENTS[ch];
    if (mapped !== undefined) {
      out += mapped;
      continue;
    }
    const cp = ch.codePointAt(0) ?? 0;
    if (cp < 0x20 && cp !== 0x0a) continue;
    const ok = charset ? charset.has(cp) && isWinAnsi(cp) : isWinAnsi(cp);
    if (ok) out += ch;
    else {
      // Letters with accents outside WinAnsi lose the accent rather than the letter.
      const base = ch.normalize('NFD').replace(/[\u0300-\u036f]/g, '');
      const baseCp = base.codePointAt(0) ?? 0;
      out += base.length === 1 && isWinAnsi(baseCp) ? base : '?';
    }
  }
  return out;
}

/** A safe file-name stem (ASCII letters, digits, dashes) for Content-Disposition. */
export function fileStem(name: string): string {
  const stem = name
    .normalize('NFD')
    .replace(/[\u0300-\u036f]/g, '')
    .replace(/[^A-Za-z0-9]+/g, '-')
    .replace(/^-+|-+$/g, '')
    .toLowerCase()
    .slice(0, 80);
  return stem || 'report';
}
