/** One benchmark figure. Add a file in scripts/bench/ and list it in scripts/bench/index.ts. */
export interface BenchFigure {
  name: string
  /** Human-readable target, e.g. "<= 1.0". */
  target: string
  unit?: string
  /** Environment variables the figure needs; when one is missing it is reported as skipped. */
  requiresEnv?: string[]
  run(ctx: BenchContext): Promise<number>
  /** Whether a value meets the target. */
  meets(value: number): boolean
}

export interface BenchContext {
  /** Shared inputs built once (e.g. the 36,000-sample drive), keyed by name. */
  memo<T>(key: string, make: () => T): T
  env: NodeJS.ProcessEnv
}

export type BenchResult =
  | { name: string; target: string; unit?: string; value: number; meets: boolean }
  | { name: string; target: string; unit?: string; skipped: true; reason: string }

/** Best (smallest) time in ms over `runs` calls after `warmup` unmeasured calls. */
export function bestOfMs(fn: () => unknown, runs = 15, warmup = 3): number {
  for (let i = 0; i < warmup; i++) fn()
  let best = Infinity
  for (let i = 0; i < runs; i++) {
    const t0 = performance.now()
    fn()
    const ms = performance.now() - t0
    if (ms < best) best = ms
  }
  return best
}
