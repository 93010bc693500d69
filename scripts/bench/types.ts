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

/** What a figure is held to: the target as the report prints it, with the test of a value that goes with it. */
type Limit = Pick<BenchFigure, "target" | "unit" | "meets">

const limit = (op: string, n: number, meets: (v: number) => boolean, unit?: string): Limit => ({
  target: `${op} ${n}`,
  ...(unit ? { unit } : {}),
  meets,
})
export const atMost = (n: number, unit?: string) => limit("<=", n, (v) => v <= n, unit)
export const below = (n: number, unit?: string) => limit("<", n, (v) => v < n, unit)
export const atLeast = (n: number, unit?: string) => limit(">=", n, (v) => v >= n, unit)

/** What a figure against the running app needs: the app (BASE_URL) and its database (DATABASE_URL). */
export const APP_ENV = ["BASE_URL", "DATABASE_URL"]

/** A figure: its name as reported, what it is held to, the environment it needs, and how it is measured. */
export function benchFigure(
  name: string,
  held: Limit,
  requiresEnv: string[],
  run: (ctx: BenchContext) => Promise<number>,
): BenchFigure {
  return { name, ...held, requiresEnv, run }
}
