import type { CheckResult, RoadTestCheck } from "@/lib/drive-file/road-test"
import type { Mark2 as Mark } from "@/lib/drive-file/schema"
import { mphToMps, mpsToMph } from "@/lib/units"
import type { Verdict } from "./types"

/**
 * How one check came out:
 * - `passed`: the latest counted result is a pass (at or above the check's speed, or the check has none);
 * - `failed`: the latest counted result is a fail;
 * - `not_equipped`: the latest counted result says the vehicle has no such function;
 * - `below_speed`: only passes below the check's speed (or at an unknown speed) were logged: not counted;
 * - `not_logged`: nobody logged it.
 */
type CheckStatus = "passed" | "failed" | "not_equipped" | "below_speed" | "not_logged"

interface CheckOutcome extends RoadTestCheck {
  status: CheckStatus
  /** The result of the mark that decided the status (the latest uncounted pass for below_speed); null when not logged. */
  result: CheckResult | null
  /** Rule 6 speed at that mark, mph with one decimal; null when unknown or not logged. */
  speedMph: number | null
  /** That mark's time, ms since the epoch; null when not logged. */
  t: number | null
  /** Whether this outcome keeps the road test from being met. */
  blocks: boolean
  /** One plain sentence when the outcome blocks, or a note for a where-equipped check nobody logged. */
  reason?: string
}

export interface RoadTestScore {
  met: boolean
  /** The road test's own verdict: met, not_met (a check failed) or unverified (a required check not passed at speed). */
  verdict: Verdict
  reasons: string[]
  checks: CheckOutcome[]
  passedRequired: number
  required: number
}

/**
 * Road-test rules (lib/drive-file/FORMAT-2.md): for each check, the check marks naming it are read in time
 * order; a `fail` or `not_equipped` always counts, a `pass` counts only when the speed at that moment
 * (rule 6) is known and at or above the check's minimum speed (any pass counts when it has none). The latest
 * counted mark decides. Verdict, first match wins: `not_met` when any check failed (a where-equipped
 * function that is fitted and fails is a failure too); `unverified` when a required check did not pass at
 * its speed (not logged, only below speed, or marked not equipped); `met` otherwise.
 */
export function scoreRoadTest(
  checks: readonly RoadTestCheck[],
  marks: readonly Mark[],
  speedAtMoment: (ms: number) => number | null,
): RoadTestScore {
  const outcomes = checks.map((c) =>
    checkOutcome(
      c,
      marks.filter((m) => m.kind === "check" && m.checkKey === c.key),
      speedAtMoment,
    ),
  )
  const failed = outcomes.filter((o) => o.status === "failed")
  const verdict: Verdict = failed.length > 0 ? "not_met" : outcomes.some((o) => o.blocks) ? "unverified" : "met"
  const required = outcomes.filter((o) => o.need === "required")
  return {
    met: verdict === "met",
    verdict,
    reasons: outcomes.filter((o) => o.blocks).map((o) => o.reason!),
    checks: outcomes,
    passedRequired: required.filter((o) => o.status === "passed").length,
    required: required.length,
  }
}

function checkOutcome(
  c: RoadTestCheck,
  own: readonly Mark[],
  speedAtMoment: (ms: number) => number | null,
): CheckOutcome {
  const minMps = c.minSpeedMph === null ? null : mphToMps(c.minSpeedMph)
  let decided: { mark: Mark; speed: number | null } | null = null
  let slow: { mark: Mark; speed: number | null } | null = null
  for (const m of own) {
    const speed = speedAtMoment(m.t)
    const counts = m.result !== "pass" || minMps === null || (speed !== null && speed >= minMps)
    if (counts) decided = { mark: m, speed }
    else slow = { mark: m, speed }
  }
  const pick = decided ?? slow
  const base = {
    ...c,
    result: pick ? (pick.mark.result ?? null) : null,
    speedMph: pick && pick.speed !== null ? Math.round(mpsToMph(pick.speed) * 10) / 10 : null,
    t: pick ? pick.mark.t : null,
  }
  const at = base.speedMph === null ? "at an unknown speed" : `at ${num(base.speedMph)} mph`
  const speedWords = c.minSpeedMph === null ? "" : ` at ${num(c.minSpeedMph)} mph or faster`
  if (decided) {
    const result = decided.mark.result
    if (result === "pass") return { ...base, status: "passed", blocks: false }
    if (result === "fail")
      return { ...base, status: "failed", blocks: true, reason: `Road test: "${c.label}" failed (${at}).` }
    if (c.need === "required") {
      return {
        ...base,
        status: "not_equipped",
        blocks: true,
        reason: `Road test: "${c.label}" is required but was marked not equipped.`,
      }
    }
    return { ...base, status: "not_equipped", blocks: false }
  }
  if (slow) {
    const reason = `Road test: "${c.label}" passed only ${at}; it counts${speedWords}.`
    return c.need === "required"
      ? { ...base, status: "below_speed", blocks: true, reason }
      : { ...base, status: "below_speed", blocks: false, reason }
  }
  if (c.need === "required") {
    return {
      ...base,
      status: "not_logged",
      blocks: true,
      reason: `Road test: "${c.label}" was not logged as passed${speedWords}.`,
    }
  }
  return {
    ...base,
    status: "not_logged",
    blocks: false,
    reason: `Road test: "${c.label}" (where equipped) was not logged.`,
  }
}

const SEVERITY: Record<Verdict, number> = { met: 0, unverified: 1, short: 2, not_met: 3 }

/** A drive that is both a learn and a road test gets the worse of the two verdicts (not_met, short, unverified, met). */
export function worseVerdict(a: Verdict, b: Verdict): Verdict {
  return SEVERITY[b] > SEVERITY[a] ? b : a
}

function num(x: number): string {
  return String(Math.round(x * 10) / 10)
}
