import type { Mark2 as Mark, Sample } from "@/lib/drive-file/schema"
import type { ResolvedProfile } from "@/lib/drive-file/profile"
import { mphToMps } from "@/lib/units"
import { intervalDistanceInto } from "./geodesy"
import { applyLeadMark, type LeadState } from "./lead-state"
import type { DriveSums } from "./types"

/**
 * Half-width of the window used to smooth a speed derived from positions (rule 5, only for samples
 * without their own speed): distance over time across the kept samples within ±1 s in the same
 * stretch without data gaps, and at least one neighbour on each side where the stretch has one.
 */
const DERIVED_SPEED_HALF_WINDOW_MS = 1000

/** What the verdict needs from the engine, before wording. */
export interface EngineTotals extends DriveSums {
  samplesReceived: number
  clearedAtMs: number | null
  accelEvents: number
  decelEvents: number
  /** Marks sorted by time, ties in arrival (file) order. */
  marks: readonly Mark[]
}

/**
 * The one scorer behind scoreDrive and the live meters. Samples and marks are kept sorted; the
 * sums run over intervals in time order and are resumed where they stopped when data is appended
 * in order, so a live score is bit-for-bit the batch score. Data that lands before what has been
 * summed already (an out-of-order or late batch) makes the next score() start the sums over.
 */
export class ScoringEngine {
  readonly profile: ResolvedProfile
  private readonly minSpeedMps: number
  private readonly maxSpeedMps: number
  private readonly maxGapMs: number
  private readonly verifySpeedMps: number

  // Kept samples, sorted by t, unique t.
  private n = 0
  private t = new Float64Array(0)
  private lat = new Float64Array(0)
  private lon = new Float64Array(0)
  private speed = new Float64Array(0) // NaN = the device gave none
  private dist = new Float64Array(0) // interval i: sample i -> i+1
  private cum = new Float64Array(0) // cum[i] = distance from sample 0 to sample i

  private received = 0
  private droppedForAccuracy = 0
  private duplicates = 0

  private marks: Mark[] = []
  private leadMarks: Mark[] = []
  private clearedAtMs: number | null = null

  // Running sums over intervals [0, p).
  private p = 0
  private mp = 0
  private leadOn = false
  private gapFt: number | null = null
  private gapS = 0
  private qualS = 0
  private follS = 0
  private qualBeforeClearS = 0
  private follBeforeClearS = 0

  // Harsh events classified over intervals [0, h), where both end speeds are final.
  private h = 0
  private hSpeed = 0
  private accelEvents = 0
  private decelEvents = 0
  private inAccel = false
  private inDecel = false

  constructor(profile: ResolvedProfile) {
    this.profile = profile
    this.minSpeedMps = mphToMps(profile.minSpeedMph)
    this.maxSpeedMps = profile.maxSpeedMph === null ? Infinity : mphToMps(profile.maxSpeedMph)
    this.maxGapMs = profile.maxGapSeconds * 1000
    this.verifySpeedMps = mphToMps(profile.verifySpeedMph)
  }

  addSamples(samples: readonly Sample[]): void {
    this.received += samples.length
    this.ensureCapacity(this.n + samples.length)
    const maxAccuracyM = this.profile.maxAccuracyM
    let late: Sample[] | null = null
    for (let k = 0; k < samples.length; k++) {
      const s = samples[k]!
      const acc = s.accuracy
      if (acc !== undefined && acc !== null && acc > maxAccuracyM) {
        this.droppedForAccuracy++
        continue
      }
      const n = this.n
      if (n === 0 || s.t > this.t[n - 1]!) {
        this.append(s)
      } else if (this.indexOfTime(s.t) >= 0) {
        this.duplicates++ // rule 1: of samples with the same t keep the first
      } else {
        ;(late ??= []).push(s)
      }
    }
    if (late) this.mergeLate(late)
  }

  addMarks(marks: readonly Mark[]): void {
    for (const m of marks) {
      insertSortedStable(this.marks, m)
      if (m.kind === "lead-on" || m.kind === "gap" || m.kind === "lead-off") {
        insertSortedStable(this.leadMarks, m)
        // Intervals already summed took their lead state from marks at or before their start.
        if (this.p > 0 && m.t <= this.t[this.p - 1]!) this.invalidate()
      } else if (m.kind === "cleared" && (this.clearedAtMs === null || m.t < this.clearedAtMs)) {
        this.clearedAtMs = m.t
        if (this.p > 0 && m.t < this.t[this.p]!) this.invalidate()
      }
    }
  }

  totals(): EngineTotals {
    this.advance()
    const n = this.n
    const harsh = this.harshCounts()
    return {
      samplesReceived: this.received,
      samplesDroppedForAccuracy: this.droppedForAccuracy,
      duplicateSamples: this.duplicates,
      samplesUsed: n,
      startedAtMs: n > 0 ? this.t[0]! : null,
      endedAtMs: n > 0 ? this.t[n - 1]! : null,
      durationSeconds: n > 1 ? (this.t[n - 1]! - this.t[0]!) / 1000 : 0,
      distanceMeters: n > 0 ? this.cum[n - 1]! : 0,
      gapSeconds: this.gapS,
      qualifyingSeconds: this.qualS,
      followingSeconds: this.follS,
      qualifyingSecondsBeforeClear: this.qualBeforeClearS,
      followingSecondsBeforeClear: this.follBeforeClearS,
      clearedAtMs: this.clearedAtMs,
      accelEvents: harsh.accel,
      decelEvents: harsh.decel,
      marks: this.marks,
    }
  }

  /** Rule 6: speed (m/s) of the first non-gap interval with t_start <= moment <= t_end; null = unknown. */
  speedAtMoment(ms: number): number | null {
    const n = this.n
    if (n < 2 || ms < this.t[0]! || ms > this.t[n - 1]!) return null
    // first interval i whose end t[i+1] >= ms
    let lo = 1
    let hi = n - 1
    while (lo < hi) {
      const mid = (lo + hi) >>> 1
      if (this.t[mid]! >= ms) hi = mid
      else lo = mid + 1
    }
    for (let i = lo - 1; i <= n - 2 && this.t[i]! <= ms; i++) {
      if (!this.isGap(i)) return this.intervalSpeed(i)
    }
    return null
  }

  get verifySpeedThresholdMps(): number {
    return this.verifySpeedMps
  }

  // ---- samples ----

  private append(s: Sample): void {
    const i = this.n++
    this.put(i, s)
    this.computeGeometry(i)
  }

  private put(i: number, s: Sample): void {
    this.t[i] = s.t
    this.lat[i] = s.lat
    this.lon[i] = s.lon
    const v = s.speed
    this.speed[i] = v === undefined || v === null ? NaN : v
  }

  private computeGeometry(i: number): void {
    if (i === 0) {
      this.cum[0] = 0
      return
    }
    intervalDistanceInto(this.lat, this.lon, i - 1, i, this.dist, i - 1)
    this.cum[i] = this.cum[i - 1]! + this.dist[i - 1]!
  }

  /** Late samples (not after the last kept one): merge, keeping the earliest arrival per t. */
  private mergeLate(late: Sample[]): void {
    const order = late.map((_, k) => k).sort((a, b) => late[a]!.t - late[b]!.t || a - b)
    const kept = { t: this.t, lat: this.lat, lon: this.lon, speed: this.speed }
    const oldN = this.n
    const total = oldN + late.length
    this.t = new Float64Array(total)
    this.lat = new Float64Array(total)
    this.lon = new Float64Array(total)
    this.speed = new Float64Array(total)
    this.dist = new Float64Array(total)
    this.cum = new Float64Array(total)
    this.n = 0
    let a = 0
    let b = 0
    let lastT = -Infinity
    while (a < oldN || b < order.length) {
      const takeKept = b >= order.length || (a < oldN && kept.t[a]! <= late[order[b]!]!.t)
      if (takeKept) {
        const i = this.n++
        this.t[i] = kept.t[a]!
        this.lat[i] = kept.lat[a]!
        this.lon[i] = kept.lon[a]!
        this.speed[i] = kept.speed[a]!
        a++
      } else {
        const s = late[order[b++]!]!
        if (s.t === lastT) {
          this.duplicates++
          continue
        }
        this.put(this.n++, s)
      }
      lastT = this.t[this.n - 1]!
    }
    for (let i = 0; i < this.n; i++) this.computeGeometry(i)
    this.invalidate()
  }

  private ensureCapacity(needed: number): void {
    if (needed <= this.t.length) return
    const cap = Math.max(needed, this.t.length * 2, 64)
    const grow = (a: Float64Array) => {
      const b = new Float64Array(cap)
      b.set(a.subarray(0, this.n))
      return b
    }
    this.t = grow(this.t)
    this.lat = grow(this.lat)
    this.lon = grow(this.lon)
    this.speed = grow(this.speed)
    this.dist = grow(this.dist)
    this.cum = grow(this.cum)
  }

  private indexOfTime(ms: number): number {
    let lo = 0
    let hi = this.n - 1
    while (lo <= hi) {
      const mid = (lo + hi) >>> 1
      const v = this.t[mid]!
      if (v === ms) return mid
      if (v < ms) lo = mid + 1
      else hi = mid - 1
    }
    return -1
  }

  // ---- interval rules ----

  private isGap(i: number): boolean {
    return this.t[i + 1]! - this.t[i]! > this.maxGapMs
  }

  /** Rule 3: mean of the two device speeds when both exist, else geodesic distance / dt. */
  private intervalSpeed(i: number): number {
    const a = this.speed[i]!
    const b = this.speed[i + 1]!
    if (a === a && b === b) return (a + b) / 2
    return this.dist[i]! / ((this.t[i + 1]! - this.t[i]!) / 1000)
  }

  private invalidate(): void {
    this.p = 0
    this.mp = 0
    this.leadOn = false
    this.gapFt = null
    this.gapS = 0
    this.qualS = 0
    this.follS = 0
    this.qualBeforeClearS = 0
    this.follBeforeClearS = 0
    this.h = 0
    this.hSpeed = 0
    this.accelEvents = 0
    this.decelEvents = 0
    this.inAccel = false
    this.inDecel = false
  }

  /** Rules 2-4 and 7: sum the intervals not yet summed, in time order. */
  private advance(): void {
    const last = this.n - 1
    if (this.p >= last) return
    const t = this.t
    const leadMarks = this.leadMarks
    const { min: gapMinFt, max: gapMaxFt } = this.profile.leadGapFt
    const clearMs = this.clearedAtMs
    const minV = this.minSpeedMps
    const maxV = this.maxSpeedMps
    const maxGapMs = this.maxGapMs
    let { mp, gapS, qualS, follS, qualBeforeClearS, follBeforeClearS } = this
    const lead: LeadState = { leadOn: this.leadOn, gapFt: this.gapFt }
    for (let i = this.p; i < last; i++) {
      const t0 = t[i]!
      const t1 = t[i + 1]!
      const dtS = (t1 - t0) / 1000
      while (mp < leadMarks.length && leadMarks[mp]!.t <= t0) applyLeadMark(lead, leadMarks[mp++]!)
      if (t1 - t0 > maxGapMs) {
        gapS += dtS
        continue
      }
      const v = this.intervalSpeed(i)
      if (!(v >= minV && v <= maxV)) continue
      const gapFt = lead.gapFt
      const following = lead.leadOn && (gapFt === null || (gapFt >= gapMinFt && gapFt <= gapMaxFt))
      qualS += dtS
      if (following) follS += dtS
      if (clearMs === null || t1 <= clearMs) {
        qualBeforeClearS += dtS
        if (following) follBeforeClearS += dtS
      } else if (t0 < clearMs) {
        const partS = (clearMs - t0) / 1000 // rule 7: pro rata
        qualBeforeClearS += partS
        if (following) follBeforeClearS += partS
      }
    }
    this.p = last
    Object.assign(this, {
      mp,
      leadOn: lead.leadOn,
      gapFt: lead.gapFt,
      gapS,
      qualS,
      follS,
      qualBeforeClearS,
      follBeforeClearS,
    })
  }

  // ---- rule 5: harsh events ----

  /** Sample speed: its own, else smoothed from positions (see DERIVED_SPEED_HALF_WINDOW_MS). */
  private sampleSpeed(j: number): number {
    const own = this.speed[j]!
    if (own === own) return own
    const t = this.t
    const last = this.n - 1
    const tj = t[j]!
    let lo = j
    while (lo > 0 && !this.isGap(lo - 1) && tj - t[lo - 1]! <= DERIVED_SPEED_HALF_WINDOW_MS) lo--
    if (lo === j && j > 0 && !this.isGap(j - 1)) lo = j - 1
    let hi = j
    while (hi < last && !this.isGap(hi) && t[hi + 1]! - tj <= DERIVED_SPEED_HALF_WINDOW_MS) hi++
    if (hi === j && j < last && !this.isGap(j)) hi = j + 1
    if (lo < hi) return (this.cum[hi]! - this.cum[lo]!) / ((t[hi]! - t[lo]!) / 1000)
    // Alone between gaps: the spec's literal rule (no non-gap interval uses this value).
    if (j > 0) return this.intervalSpeed(j - 1)
    if (j < last) return this.intervalSpeed(j)
    return 0
  }

  /** A sample's speed can no longer change once later in-order samples cannot enter its window. */
  private sampleSpeedFinal(j: number): boolean {
    const own = this.speed[j]!
    if (own === own) return true
    const last = this.n - 1
    return j < last && (this.isGap(j) || this.t[last]! - this.t[j]! >= DERIVED_SPEED_HALF_WINDOW_MS)
  }

  private harshCounts(): { accel: number; decel: number } {
    const last = this.n - 1
    if (last < 1) return { accel: 0, decel: 0 }
    const maxAccel = this.profile.maxAccelMps2
    const maxDecel = this.profile.maxDecelMps2
    if (this.h === 0) this.hSpeed = this.sampleSpeed(0)
    // Intervals whose end speeds are final are committed; from the first that is not, the tail is
    // counted with the speeds known now, without committing it.
    let { h, hSpeed, accelEvents, decelEvents, inAccel, inDecel } = this
    let committing = true
    for (let i = h; i < last; i++) {
      if (committing && !((i > 0 || this.sampleSpeedFinal(0)) && this.sampleSpeedFinal(i + 1))) {
        committing = false
        this.commitHarsh(i, hSpeed, accelEvents, decelEvents, inAccel, inDecel)
      }
      const next = this.sampleSpeed(i + 1)
      if (this.isGap(i)) {
        inAccel = inDecel = false
      } else {
        const a = (next - hSpeed) / ((this.t[i + 1]! - this.t[i]!) / 1000)
        if (a > maxAccel) {
          if (!inAccel) accelEvents++
          inAccel = true
        } else inAccel = false
        if (a < -maxDecel) {
          if (!inDecel) decelEvents++
          inDecel = true
        } else inDecel = false
      }
      hSpeed = next
    }
    if (committing) this.commitHarsh(Math.max(h, last), hSpeed, accelEvents, decelEvents, inAccel, inDecel)
    return { accel: accelEvents, decel: decelEvents }
  }

  // Plain field writes, not Object.assign with a literal: that line runs after the loop, where the optimised
  // code (compiled while the loop ran) had no type feedback, and it threw that code away on every score.
  private commitHarsh(
    h: number,
    hSpeed: number,
    accelEvents: number,
    decelEvents: number,
    inAccel: boolean,
    inDecel: boolean,
  ): void {
    this.h = h
    this.hSpeed = hSpeed
    this.accelEvents = accelEvents
    this.decelEvents = decelEvents
    this.inAccel = inAccel
    this.inDecel = inDecel
  }
}

/** Insert after every element with t <= m.t: sorted by t, ties in arrival order. */
function insertSortedStable(list: Mark[], m: Mark): void {
  const i = list.length
  if (i === 0 || list[i - 1]!.t <= m.t) {
    list.push(m)
    return
  }
  let lo = 0
  let hi = i
  while (lo < hi) {
    const mid = (lo + hi) >>> 1
    if (list[mid]!.t <= m.t) lo = mid + 1
    else hi = mid
  }
  list.splice(lo, 0, m)
}
