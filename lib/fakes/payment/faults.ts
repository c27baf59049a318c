/** Switchable faults for `/v1` requests, set by `POST /_fake/faults`. */

export interface FaultConfig {
  /** Share of matching requests answered with `status` instead of being handled, 0..1. */
  failRate: number;
  status: 500 | 429;
  /** Added before every matching request is handled, whether it then fails or not. */
  delayMs: number;
  /** Path prefixes (`/v1/billing/meter_events`) the faults apply to; null for every `/v1` path. */
  onlyPaths: string[] | null;
  /** This many matching requests fail first, before `failRate` is consulted. */
  failNext: number;
  /** Makes `failRate` draws repeatable. */
  seed: number | null;
}

export interface FaultDecision {
  delayMs: number;
  failWith: 500 | 429 | null;
}

export const NO_FAULTS: Readonly<FaultConfig> = {
  failRate: 0,
  status: 500,
  delayMs: 0,
  onlyPaths: null,
  failNext: 0,
  seed: null,
};

function mulberry32(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4_294_967_296;
  };
}

export class Faults {
  private config: FaultConfig = { ...NO_FAULTS };
  private random: () => number = Math.random;
  matched = 0;
  injected = 0;

  get current(): FaultConfig {
    return { ...this.config, onlyPaths: this.config.onlyPaths ? [...this.config.onlyPaths] : null };
  }

  set(config: FaultConfig): void {
    this.config = { ...config };
    this.random = config.seed === null ? Math.random : mulberry32(config.seed);
    this.matched = 0;
    this.injected = 0;
  }

  reset(): void {
    this.set({ ...NO_FAULTS });
  }

  decide(pathname: string): FaultDecision {
    const c = this.config;
    const applies = c.onlyPaths === null || c.onlyPaths.some((p) => pathname === p || pathname.startsWith(p));
    if (!applies) return { delayMs: 0, failWith: null };
    this.matched += 1;
    let fail = false;
    if (c.failNext > 0) {
      c.failNext -= 1;
      fail = true;
    } else if (c.failRate > 0) {
      fail = this.random() < c.failRate;
    }
    if (fail) this.injected += 1;
    return { delayMs: c.delayMs, failWith: fail ? c.status : null };
  }
}
