/**
 * Screening inputs read per chunk by the import worker, at most about this many characters of JSON.
 * A chunk of 500 flown tracks of 500 points is some 27 MB of input that the server holds, copies to a
 * screening thread and parses there; past this budget the next chunks take fewer flights, so the
 * server's memory stays flat through a big track import. Schedule flights (a few hundred characters
 * each) stay far below it and keep the full chunk.
 */
export const IMPORT_CHUNK_CHARS = 4_000_000;

/** The next chunk's size: `size`, or fewer flights (at least one) when this chunk's inputs passed the budget. */
export function nextChunkSize(
  size: number,
  chunk: readonly { inputJson: string }[],
  budget = IMPORT_CHUNK_CHARS,
): number {
  let chars = 0;
  for (const p of chunk) chars += p.inputJson.length;
  if (chars <= budget) return size;
  return Math.max(1, Math.floor((chunk.length * budget) / chars));
}
