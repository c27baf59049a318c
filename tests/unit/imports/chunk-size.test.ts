import { describe, expect, it } from 'vitest';
import { IMPORT_CHUNK_CHARS, nextChunkSize } from '@/lib/imports/chunk-size';

const flights = (n: number, chars: number) => Array.from({ length: n }, () => ({ inputJson: 'x'.repeat(chars) }));

describe('import chunk size', () => {
  it('keeps the full chunk for schedule-sized inputs', () => {
    expect(nextChunkSize(500, flights(500, 400))).toBe(500);
  });

  it('shrinks the next chunk of big track inputs to the character budget', () => {
    // 500 tracks of 54 000 characters (500 points) are 27 M characters: the budget holds 74 of them.
    const next = nextChunkSize(500, flights(500, 54_000));
    expect(next).toBe(Math.floor((500 * IMPORT_CHUNK_CHARS) / (500 * 54_000)));
    expect(next * 54_000).toBeLessThanOrEqual(IMPORT_CHUNK_CHARS);
    expect(nextChunkSize(next, flights(next, 54_000))).toBe(next);
  });

  it('never goes below one flight', () => {
    expect(nextChunkSize(500, flights(2, 10), 5)).toBe(1);
  });
});
