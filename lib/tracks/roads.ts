// Invented drives on invented road layouts around a shop, for the road-knowledge demo, tests and
// benchmarks. A layout is a line of road out from the shop; a drive goes out along it and back (again and
// again) until the learn completes or the drive times out. Speeds follow the kind of road and the traffic
// of the hour: nothing here is a real road or a real drive.
import { DRIVE_FORMAT, type DriveFile, type Mark, type Profile, type Sample } from "@/lib/drive-file/schema"
import { MPS_PER_MPH } from "@/lib/units"
import { createRng } from "./index"

type RoadKind = "steady" | "stop-and-go" | "winding"

export interface RoadLayout {
  key: string
  /** An invented name. */
  name: string
  kind: RoadKind
  /** Direction of the road from the shop, degrees from north. */
  headingDeg: number
  /** One way, metres. */
  lengthM: number
}

export interface RoadDriveOptions {
  layout: RoadLayout
  seed: number
  startMs: number
  home: { lat: number; lon: number }
  /** 0 = free-flowing, 1 = heavy: more and longer slow-downs. */
  traffic?: number
  /** Samples per second; default 1. */
  hz?: number
  profile?: Profile
  /** Qualifying seconds the vehicle needs before it reports the learn complete; default 600-720 from the seed. */
  learnSeconds?: number
  /** The drive times out (no learn complete) after this long; default 30. */
  maxMinutes?: number
}

const M_PER_DEG_LAT = 110_574
const QUALIFY_MPS = 35 * MPS_PER_MPH

/** The outward road as points every 10 m. */
function roadPoints(layout: RoadLayout, home: { lat: number; lon: number }, rng: () => number): [number, number][] {
  const pts: [number, number][] = [[home.lat, home.lon]]
  const cosLat = Math.cos((home.lat * Math.PI) / 180)
  let x = 0
  let y = 0
  const steps = Math.ceil(layout.lengthM / 10)
  const phase = rng() * 0 // the layout is the same for every drive: no randomness in the road itself
  for (let i = 1; i <= steps; i++) {
    const s = i * 10
    let heading = layout.headingDeg
    if (layout.kind === "winding") heading += 40 * Math.sin((2 * Math.PI * s) / 900 + phase)
    else if (layout.kind === "steady") heading += s > layout.lengthM / 2 ? 12 : 0
    else heading += 3 * Math.sin((2 * Math.PI * s) / 3000)
    const h = (heading * Math.PI) / 180
    x += 10 * Math.sin(h)
    y += 10 * Math.cos(h)
    pts.push([home.lat + y / M_PER_DEG_LAT, home.lon + x / (M_PER_DEG_LAT * cosLat)])
  }
  return pts
}

function pointAt(pts: [number, number][], s: number): [number, number] {
  const L = (pts.length - 1) * 10
  let u = s % (2 * L)
  if (u > L) u = 2 * L - u
  const i = Math.min(pts.length - 2, Math.floor(u / 10))
  const f = u / 10 - i
  const a = pts[i]!
  const b = pts[i + 1]!
  return [a[0] + (b[0] - a[0]) * f, a[1] + (b[1] - a[1]) * f]
}

export function generateRoadDrive(o: RoadDriveOptions): DriveFile {
  const rng = createRng(o.seed)
  const between = (lo: number, hi: number) => lo + (hi - lo) * rng()
  const hz = o.hz ?? 1
  const dt = 1 / hz
  const traffic = Math.max(0, Math.min(1, o.traffic ?? 0))
  const maxS = (o.maxMinutes ?? 30) * 60
  const learnS = o.learnSeconds ?? between(600, 720)
  const pts = roadPoints(o.layout, o.home, rng)
  const kind = o.layout.kind
  const cruiseMph = kind === "steady" ? between(50, 55) : kind === "winding" ? between(46, 52) : between(36, 40)

  const samples: Sample[] = []
  const marks: Mark[] = []
  const at = (tS: number) => o.startMs + Math.round(tS * 1000)
  const leadFrom = kind === "winding" ? 60 : 40
  const leadTo = kind === "winding" ? 420 : Infinity
  marks.push({ t: at(leadFrom), kind: "lead-on", gapFt: 130 })
  if (Number.isFinite(leadTo)) marks.push({ t: at(leadTo), kind: "lead-off" })

  let v = 0
  let s = 0
  let qualifying = 0
  let following = 0
  let clearedAt: number | null = null
  let endS = maxS
  // Slow-downs (and, on the arterial, signal stops): [fromS, toS, targetMph]
  let slowUntil = -1
  let slowTarget = 0
  let hardStop = false
  let nextSlow =
    kind === "stop-and-go" ? between(30, 70) : traffic > 0 ? between(30, 200 * (1 - traffic) + 40) : Infinity
  for (let i = 0; ; i++) {
    const tS = i * dt
    if (tS > endS) break
    const [lat, lon] = pointAt(pts, s)
    samples.push({
      t: at(tS),
      lat: round(lat, 7),
      lon: round(lon, 7),
      speed: round(v, 2),
      accuracy: Math.round(between(3, 8) * 10) / 10,
    })
    if (tS >= nextSlow && tS >= slowUntil) {
      if (kind === "stop-and-go") {
        slowTarget = 0
        hardStop = rng() < 0.15
        slowUntil = tS + between(15, 40) * (1 + traffic)
        nextSlow = slowUntil + between(25, 60) * (1 - 0.6 * traffic)
      } else {
        slowTarget = between(8, 22)
        slowUntil = tS + between(20, 40) + 70 * traffic
        nextSlow = slowUntil + between(40, 200 * (1 - traffic) + 40)
      }
    }
    const slowing = tS < slowUntil
    let target = slowing ? slowTarget : cruiseMph - 6 * traffic + 1.5 * Math.sin((2 * Math.PI * tS) / 80)
    if (kind === "winding" && !slowing) target -= 10 * Math.abs(Math.sin((2 * Math.PI * s) / 900))
    if (clearedAt != null && tS > endS - 25) target = 0
    const targetMps = Math.max(0, target * MPS_PER_MPH)
    const hard = hardStop && slowing && tS < slowUntil - 10
    const accel = hard && v > 0 ? -4.2 : Math.max(-2.6, Math.min(1.4, 0.45 * (targetMps - v)))
    const nv = Math.max(0, v + accel * dt)
    s += ((v + nv) / 2) * dt
    const meanV = (v + nv) / 2
    v = nv
    if (meanV >= QUALIFY_MPS) {
      qualifying += dt
      if (tS >= leadFrom && tS < leadTo) following += dt
    }
    if (clearedAt == null && qualifying >= learnS && following >= 120) {
      clearedAt = tS + dt
      marks.push({ t: at(clearedAt), kind: "cleared" })
      endS = Math.min(maxS + 120, clearedAt + 120)
    }
    if (clearedAt != null && !marks.some((m) => m.kind === "verified") && tS >= clearedAt + 20 && v >= 12) {
      marks.push({ t: at(tS), kind: "verified" })
    }
  }
  marks.push({ t: samples[samples.length - 1]!.t, kind: "stopped" })
  marks.sort((a, b) => a.t - b.t)
  const file: DriveFile = { format: DRIVE_FORMAT, samples, marks }
  if (o.profile) file.profile = o.profile
  return file
}

function round(x: number, d: number): number {
  const k = 10 ** d
  return Math.round(x * k) / k
}

/** Three invented roads out of the demo shop: a divided road, a signal-heavy arterial, a rural road with bends. */
export const DEMO_ROAD_LAYOUTS: RoadLayout[] = [
  { key: "kestrel-ridge", name: "Kestrel Ridge Parkway", kind: "steady", headingDeg: 35, lengthM: 6500 },
  { key: "old-tannery", name: "Old Tannery Avenue", kind: "stop-and-go", headingDeg: 255, lengthM: 5500 },
  { key: "harrow-bend", name: "Harrow Bend Road", kind: "winding", headingDeg: 160, lengthM: 6000 },
]
