import { getPreciseDistance } from "geolib"
import fc from "fast-check"
import { describe, expect, it } from "vitest"
import { geodesicDistanceM, scoreDrive } from "@/lib/scoring"
import { intervalDistanceInto, WGS84_A } from "@/lib/scoring/geodesy"
import { T0, drive } from "../helpers/drive"

const dms = (d: number, m: number, s: number) => Math.sign(d) * (Math.abs(d) + m / 60 + s / 3600)
// Geoscience Australia, "Vincenty's Inverse" worked example (check-values §3a)
const FLINDERS_PEAK = { lat: dms(-37, 57, 3.7203), lon: dms(144, 25, 29.5244) }
const BUNINYONG = { lat: dms(-37, 39, 10.1561), lon: dms(143, 55, 35.3839) }
const GA_DISTANCE_M = 54972.271

// geolib 3.3.14 returns NaN for accuracy 0 (check-values §3c), so the reference uses 1e-6.
const geolibM = (a: { lat: number; lon: number }, b: { lat: number; lon: number }) =>
  getPreciseDistance({ latitude: a.lat, longitude: a.lon }, { latitude: b.lat, longitude: b.lon }, 1e-6)

/**
 * A step from (lat, lon) by (dLat, dLon) degrees, its longitude wrapped across 180°, with geolib's distance for it.
 * geolib gives NaN for some steps of a centimetre or so (e.g. 1e-7° of longitude at 1e-7° of latitude): there is no
 * reference there, so fast-check skips the case.
 */
function stepWithReference(lat: number, lon: number, dLat: number, dLon: number) {
  let lon2 = lon + dLon
  if (lon2 > 180) lon2 -= 360
  if (lon2 < -180) lon2 += 360
  const a = { lat, lon }
  const b = { lat: lat + dLat, lon: lon2 }
  const reference = geolibM(a, b)
  fc.pre(Number.isFinite(reference))
  return { a, b, reference }
}

describe("geodesic distance (Vincenty, WGS-84)", () => {
  it("matches the Geoscience Australia example Flinders Peak -> Buninyong, 54 972.271 m, to 1 mm", () => {
    expect(
      Math.abs(geodesicDistanceM(FLINDERS_PEAK.lat, FLINDERS_PEAK.lon, BUNINYONG.lat, BUNINYONG.lon) - GA_DISTANCE_M),
    ).toBeLessThan(0.001)
    expect(Math.abs(geolibM(FLINDERS_PEAK, BUNINYONG) - GA_DISTANCE_M)).toBeLessThan(0.001)
  })

  it("scores a two-sample track Flinders Peak -> Buninyong within 0.2 % of 54 972.271 m (Geoscience Australia)", () => {
    const s = scoreDrive(
      drive([
        { t: T0, ...FLINDERS_PEAK },
        { t: T0 + 3_600_000, ...BUNINYONG },
      ]),
    )
    expect(Math.abs(s.distanceMeters - GA_DISTANCE_M) / GA_DISTANCE_M).toBeLessThan(0.002)
  })

  // Karney, geographiclib geodtest.c testcases[0..2] (check-values §3b)
  it.each([
    [35.60777, -139.44815, -11.17491, -69.95921, 8935244.5604818305],
    [55.52454, 106.05087, 77.03196, 197.18234, 4105086.1713924406],
    [-21.97856, 142.59065, 41.84138, 98.56635, 8394328.894657671],
  ])("matches Karney's geodesic test case (%f, %f) -> (%f, %f) = %f m", (lat1, lon1, lat2, lon2, s12) => {
    const d = geodesicDistanceM(lat1, lon1, lat2, lon2)
    expect(Math.abs(d - s12) / s12).toBeLessThan(0.002)
    expect(Math.abs(d - s12)).toBeLessThan(0.001)
  })

  // geolib's own test, Berlin -> Dortmund, Karney gives 422 591.5505 m (check-values §3c)
  it("matches Berlin -> Dortmund 422 591.5505 m (Karney; geolib test suite)", () => {
    expect(geodesicDistanceM(52.518611, 13.408056, 51.519475, 7.46694444)).toBeCloseTo(422591.5505, 3)
  })

  // Karney geodesic (WGS-84), check-values §3c
  it("matches short Karney oracles: 1° lat at the equator, 0.001° steps", () => {
    expect(geodesicDistanceM(0, 0, 1, 0)).toBeCloseTo(110574.3886, 3)
    expect(geodesicDistanceM(0, 0, 0, 1)).toBeCloseTo(111319.4908, 3)
    expect(geodesicDistanceM(45, 0, 45.001, 0)).toBeCloseTo(111.1318, 3)
    expect(geodesicDistanceM(40, -75, 40, -74.999)).toBeCloseTo(85.3939, 3)
  })

  it("agrees with geolib getPreciseDistance on GPS-sized steps, across the 180° meridian too", () => {
    fc.assert(
      fc.property(
        // GPS-like coordinates (7 decimals); geolib itself gives NaN for sub-nanometre inputs
        fc.integer({ min: -800_000_000, max: 800_000_000 }).map((x) => x / 1e7),
        fc.integer({ min: -1_800_000_000, max: 1_800_000_000 }).map((x) => x / 1e7),
        fc.integer({ min: -100_000, max: 100_000 }).map((x) => x / 1e7),
        fc.integer({ min: 1, max: 100_000 }).map((x) => x / 1e7),
        (lat, lon, dLat, dLon) => {
          const { a, b, reference } = stepWithReference(lat, lon, dLat, dLon)
          expect(Math.abs(geodesicDistanceM(a.lat, a.lon, b.lat, b.lon) - reference)).toBeLessThan(2e-6)
        },
      ),
    )
    const a = { lat: 10, lon: 179.9999 }
    const b = { lat: 10, lon: -179.9999 }
    expect(geodesicDistanceM(a.lat, a.lon, b.lat, b.lon)).toBeCloseTo(geolibM(a, b), 5)
  })

  it("gives 0 for coincident points and a finite value where Vincenty does not converge", () => {
    expect(geodesicDistanceM(44, -92, 44, -92)).toBe(0)
    // Nearly antipodal: geolib returns NaN here; we fall back to the mean-radius great circle.
    expect(Number.isNaN(geolibM({ lat: 0, lon: 0 }, { lat: 0.5, lon: 179.7 }))).toBe(true)
    const d = geodesicDistanceM(0, 0, 0.5, 179.7)
    expect(d).toBeGreaterThan(19_900_000)
    expect(d).toBeLessThan(20_040_000)
  })
})

describe("a step between consecutive fixes (the scorer's intervalDistanceInto)", () => {
  const step = (a: { lat: number; lon: number }, b: { lat: number; lon: number }) => {
    const out = new Float64Array(1)
    intervalDistanceInto(Float64Array.of(a.lat, b.lat), Float64Array.of(a.lon, b.lon), 0, 1, out, 0)
    return out[0]!
  }

  it("stays within 1e-7 of geolib's Vincenty (getPreciseDistance) for steps under 100 m, at any latitude and across 180°", () => {
    fc.assert(
      fc.property(
        fc.integer({ min: -899_000_000, max: 899_000_000 }).map((x) => x / 1e7),
        fc.integer({ min: -1_800_000_000, max: 1_800_000_000 }).map((x) => x / 1e7),
        fc.double({ min: 0, max: 2 * Math.PI, noNaN: true }),
        fc.double({ min: 0.5, max: 99, noNaN: true }),
        (lat, lon, bearing, metres) => {
          // About `metres` apart: ~111 km a degree of latitude, less of longitude by cos(lat).
          const dLat = (metres * Math.cos(bearing)) / 111_000
          const dLon = (metres * Math.sin(bearing)) / (111_000 * Math.cos((lat * Math.PI) / 180))
          const { a, b, reference } = stepWithReference(lat, lon, dLat, dLon)
          if (reference >= 100) return // measured by Vincenty itself, below
          // Plus 10 µm: Vincenty itself stops iterating at 1e-12 rad of longitude, a few µm (see the equator below).
          expect(Math.abs(step(a, b) - reference)).toBeLessThanOrEqual(1e-7 * reference + 1e-5)
        },
      ),
      { numRuns: 2000 },
    )
  })

  it("measures 0.001° of latitude at 45° and of longitude at 40° as Karney's oracle does, to 0.1 mm", () => {
    // The same short oracles as above (111.1318 m and 85.3939 m), now through the scorer's short-step path.
    expect(step({ lat: 45, lon: 0 }, { lat: 45.001, lon: 0 })).toBeCloseTo(111.1318, 3)
    expect(step({ lat: 40, lon: -75 }, { lat: 40, lon: -74.999 })).toBeCloseTo(85.3939, 3)
  })

  it("is exact along the equator, a circle of radius a (WGS-84's semi-major axis, 6 378 137 m), where Vincenty is off by µm", () => {
    for (const dLon of [3e-6, 4.5e-6, 1e-5, 5e-4]) {
      const exact = (WGS84_A * dLon * Math.PI) / 180
      expect(Math.abs(step({ lat: 0, lon: 0 }, { lat: 0, lon: dLon }) - exact)).toBeLessThan(1e-9)
    }
    // Vincenty's iteration tolerance shows at half a metre: the reason for the 10 µm above.
    expect(Math.abs(geodesicDistanceM(0, 0, 0, 4.5e-6) - (WGS84_A * 4.5e-6 * Math.PI) / 180)).toBeGreaterThan(1e-6)
  })

  it("measures a step of 100 m or more (a gap in the data), or one within 1° of a pole, by Vincenty", () => {
    for (const [a, b] of [
      [
        { lat: 89.5, lon: 10 },
        { lat: 89.5003, lon: 10.05 },
      ],
      [
        { lat: -89.2, lon: 0 },
        { lat: -89.2001, lon: 0 },
      ],
      [FLINDERS_PEAK, BUNINYONG],
      [
        { lat: 10, lon: 179.9995 },
        { lat: 10, lon: -179.9995 },
      ],
      [
        { lat: 0, lon: 0 },
        { lat: 0.001, lon: 0 },
      ],
    ] as const)
      expect(step(a, b)).toBe(geodesicDistanceM(a.lat, a.lon, b.lat, b.lon))
  })
})
