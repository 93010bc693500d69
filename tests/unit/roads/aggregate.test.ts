import { latLngToCell } from "h3-js"
import { describe, expect, it } from "vitest"
import type { DriveFile } from "@/lib/drive-file"
import { resolveProfile } from "@/lib/drive-file/profile"
import {
  ALL,
  ROAD_RESOLUTION,
  cellFigures,
  computeDriveContribution,
  medianFromHistogram,
  mergeStat,
  statsFromStored,
  type CellStat,
} from "@/lib/roads"
import { DEMO_ROAD_LAYOUTS, generateRoadDrive } from "@/lib/tracks/roads"

const HOME = { lat: 43.8731, lon: -91.9187 }
const ZONE = "America/Chicago"

/** A history of generated drives on the three demo layouts at different hours and days. */
function history(): DriveFile[] {
  const files: DriveFile[] = []
  for (let k = 0; k < 9; k++) {
    const layout = DEMO_ROAD_LAYOUTS[k % 3]!
    const startMs = Date.UTC(2026, 2, 2 + k, 12 + ((k * 5) % 10), 7 * k)
    const file = generateRoadDrive({
      layout,
      seed: 500 + k,
      startMs,
      home: HOME,
      traffic: (k % 4) / 4,
      hz: k % 2 ? 1 : 0.5,
    })
    // a few samples too inaccurate to use, and some without a device speed
    file.samples[40] = { ...file.samples[40]!, accuracy: 45 }
    delete file.samples[50]!.speed
    files.push(file)
  }
  return files
}

/** Plain, independent computation straight from the samples (rules 1-5 of shared/specs/drive-file.md). */
function direct(files: DriveFile[]) {
  type Row = { seconds: number; q: number; f: number; harsh: number; speeds: [number, number][] }
  const cells = new Map<string, Row>()
  const byHour = new Map<string, Row>()
  const hourFmt = new Intl.DateTimeFormat("en-GB", { timeZone: ZONE, hour: "numeric", hourCycle: "h23" })
  const get = (m: Map<string, Row>, k: string) => {
    if (!m.has(k)) m.set(k, { seconds: 0, q: 0, f: 0, harsh: 0, speeds: [] })
    return m.get(k)!
  }
  for (const file of files) {
    const p = resolveProfile(file.profile)
    const s = file.samples.filter((x) => x.accuracy == null || x.accuracy <= p.maxAccuracyM)
    const marks = [...file.marks].sort((a, b) => a.t - b.t)
    const speedOf = (i: number): number => {
      const a = s[i]!
      const b = s[i + 1]!
      if (a.speed != null && b.speed != null) return (a.speed + b.speed) / 2
      // flat-earth distance is within a hair of the ellipsoid over 1-2 s of driving
      const dy = (b.lat - a.lat) * 111_132.954 - 0
      const dx = (b.lon - a.lon) * 111_412.84 * Math.cos((a.lat * Math.PI) / 180)
      return Math.hypot(dx, dy) / ((b.t - a.t) / 1000)
    }
    let prevAccel = false
    let prevDecel = false
    for (let i = 0; i + 1 < s.length; i++) {
      const a = s[i]!
      const b = s[i + 1]!
      const dt = (b.t - a.t) / 1000
      if (dt > p.maxGapSeconds) {
        prevAccel = prevDecel = false
        continue
      }
      let leadOn = false
      let gap: number | null = null
      for (const m of marks) {
        if (m.t > a.t) break
        if (m.kind === "lead-on") {
          leadOn = true
          gap = m.gapFt ?? null
        } else if (m.kind === "lead-off") {
          leadOn = false
          gap = null
        } else if (m.kind === "gap" && leadOn) gap = m.gapFt ?? gap
      }
      const v = speedOf(i)
      const cell = latLngToCell(a.lat, a.lon, ROAD_RESOLUTION)
      const hour = Number(hourFmt.format(new Date(a.t))) % 24
      const q = v >= p.minSpeedMph * 0.44704 ? dt : 0
      const f = q && leadOn && (gap == null || (gap >= p.leadGapFt.min && gap <= p.leadGapFt.max)) ? dt : 0
      const sv = (j: number) => s[j]!.speed ?? (j > 0 ? speedOf(j - 1) : speedOf(0))
      const accel = (sv(i + 1) - sv(i)) / dt
      const isA = accel > p.maxAccelMps2
      const isD = accel < -p.maxDecelMps2
      const harsh = (isA && !prevAccel) || (isD && !prevDecel) ? 1 : 0
      prevAccel = isA
      prevDecel = isD
      for (const row of [get(cells, cell), get(byHour, `${cell}|${hour}`)]) {
        row.seconds += dt
        row.q += q
        row.f += f
        row.harsh += harsh
        row.speeds.push([v / 0.44704, dt])
      }
    }
  }
  return { cells, byHour }
}

function weightedMedian(pairs: [number, number][]): number {
  const sorted = [...pairs].sort((x, y) => x[0] - y[0])
  const total = sorted.reduce((s, [, w]) => s + w, 0)
  let acc = 0
  for (const [v, w] of sorted) {
    acc += w
    if (acc >= total / 2) return v
  }
  return sorted[sorted.length - 1]![0]
}

describe("road model aggregation", () => {
  const files = history()
  const model = new Map<string, CellStat>()
  for (const file of files) {
    for (const row of computeDriveContribution(file, ZONE).stats) {
      const k = `${row.cell}|${row.hour}|${row.weekday}`
      const cur = model.get(k)
      model.set(k, cur ? mergeStat(cur, row) : row)
    }
  }
  const want = direct(files)

  it("matches a direct computation from the raw samples, cell by cell", () => {
    expect(want.cells.size).toBeGreaterThan(50)
    const allRows = [...model.values()].filter((r) => r.hour === ALL && r.weekday === ALL)
    expect(new Set(allRows.map((r) => r.cell))).toEqual(new Set(want.cells.keys()))
    let harsh = 0
    for (const row of allRows) {
      const w = want.cells.get(row.cell)!
      expect(row.seconds).toBeCloseTo(w.seconds, 6)
      expect(row.qualifyingSeconds).toBeCloseTo(w.q, 6)
      expect(row.followingSeconds).toBeCloseTo(w.f, 6)
      expect(row.harshEvents).toBe(w.harsh)
      harsh += w.harsh
      // median from 2 mph histogram buckets: within one bucket of the exact time-weighted median
      expect(Math.abs(cellFigures(row).medianSpeedMph! - weightedMedian(w.speeds))).toBeLessThanOrEqual(2)
    }
    expect(harsh).toBeGreaterThan(0)
  })

  it("matches the direct computation per local hour, and the hours add up to the whole", () => {
    const hourRows = [...model.values()].filter((r) => r.hour !== ALL)
    expect(hourRows.length).toBe(want.byHour.size)
    for (const row of hourRows) {
      const w = want.byHour.get(`${row.cell}|${row.hour}`)!
      expect(row.seconds).toBeCloseTo(w.seconds, 6)
      expect(row.qualifyingSeconds).toBeCloseTo(w.q, 6)
    }
    const dayTotal = [...model.values()].filter((r) => r.weekday !== ALL).reduce((s, r) => s + r.seconds, 0)
    const allTotal = [...model.values()]
      .filter((r) => r.hour === ALL && r.weekday === ALL)
      .reduce((s, r) => s + r.seconds, 0)
    expect(dayTotal).toBeCloseTo(allTotal, 6)
  })

  it("takes a drive back out exactly when it is subtracted", () => {
    const one = computeDriveContribution(files[0]!, ZONE).stats[0]!
    const back = mergeStat(mergeStat(one, one), one, -1)
    expect(back.seconds).toBeCloseTo(one.seconds, 9)
    expect(back.speedHist).toEqual(one.speedHist)
  })

  it("stores a compact form that gives back the same cell rows", () => {
    const c = computeDriveContribution(files[1]!, ZONE)
    const key = (r: CellStat) => `${r.cell}|${r.hour}|${r.weekday}`
    const back = new Map(statsFromStored(JSON.parse(JSON.stringify(c.buckets))).map((r) => [key(r), r]))
    expect(back.size).toBe(c.stats.length)
    for (const r of c.stats) expect(back.get(key(r))).toEqual(r)
  })

  it("reads the median from the histogram inside its bucket", () => {
    // 10 s at 40-42 mph and 30 s at 50-52 mph: half of 40 s is reached 10 s into the 50-52 bucket
    const hist = new Array(51).fill(0)
    hist[20] = 10
    hist[25] = 30
    expect(medianFromHistogram(hist)).toBeCloseTo(50 + (10 / 30) * 2, 9)
    expect(medianFromHistogram(new Array(51).fill(0))).toBeNull()
  })
})
