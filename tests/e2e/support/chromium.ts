import fs from 'node:fs';

/** Debian's Chromium (or $CHROMIUM_PATH); never a downloaded browser. */
export function findChromium(): string | null {
  for (const p of [process.env.CHROMIUM_PATH, '/usr/bin/chromium', '/usr/bin/chromium-browser']) {
    if (p && fs.existsSync(p)) return p;
  }
  return null;
}
