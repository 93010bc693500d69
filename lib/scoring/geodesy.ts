// Vincenty's inverse formula on the WGS-84 ellipsoid (T. Vincenty, Survey Review 23(176), 1975),
// the same method and constants as geolib's getPreciseDistance. We keep our own copy because the
// scorer measures every sample pair (36,000 an hour at 10 Hz) without allocating per call. Tests hold it
// to geolib and to the published Vincenty example.
//
// Consecutive GPS fixes are metres apart. For such a step the scorer uses the ellipsoid's own metric at the
// step's mid-latitude (intervalDistanceInto): far less work than Vincenty, and within 1e-7 of its distance below 89°
// of latitude (Vincenty's own iteration leaves a few µm), where the drive file allows 0.2 %.

export const WGS84_A = 6378137
export const WGS84_F = 1 / 298.257223563
const WGS84_B = WGS84_A * (1 - WGS84_F) // 6356752.314245...
/** IUGG mean radius (2a + b) / 3, used only when Vincenty does not converge (near-antipodal points). */
const MEAN_EARTH_RADIUS_M = (2 * WGS84_A + WGS84_B) / 3

const DEG = Math.PI / 180
const A2_MINUS_B2_OVER_B2 = (WGS84_A * WGS84_A - WGS84_B * WGS84_B) / (WGS84_B * WGS84_B)

/** sin and cos of the reduced latitude U = atan((1 - f) tan φ), into slot `i` of two arrays. */
function reducedLatitudeInto(latDeg: number, sinU: Float64Array, cosU: Float64Array, i: number): void {
  const phi = latDeg * DEG
  // Written with sin/cos rather than tan so that φ = ±90° stays finite.
  const y = (1 - WGS84_F) * Math.sin(phi)
  const x = Math.cos(phi)
  const r = Math.sqrt(x * x + y * y)
  sinU[i] = y / r
  cosU[i] = x / r
}

/** sin and cos of the two points' reduced latitudes (slots 0 and 1), filled by vincentyInto. */
const pairSinU = new Float64Array(2)
const pairCosU = new Float64Array(2)

/** A difference of longitudes in degrees, taken the short way round (across 180° too). */
function lonDelta(lon1: number, lon2: number): number {
  const d = lon2 - lon1
  return d > 180 ? d - 360 : d < -180 ? d + 360 : d
}

/**
 * Vincenty's geodesic distance in metres between two points in degrees, written to `out[k]`. Gives the
 * great-circle distance on the mean sphere when the iteration fails to converge (only for nearly antipodal
 * points, never between consecutive GPS fixes).
 */
function vincentyInto(lat1: number, lon1: number, lat2: number, lon2: number, out: Float64Array, k: number): void {
  reducedLatitudeInto(lat1, pairSinU, pairCosU, 0)
  reducedLatitudeInto(lat2, pairSinU, pairCosU, 1)
  const sinU1 = pairSinU[0]!
  const cosU1 = pairCosU[0]!
  const sinU2 = pairSinU[1]!
  const cosU2 = pairCosU[1]!
  const L = lonDelta(lon1, lon2) * DEG
  let lambda = L
  let sinSigma = 0
  let cosSigma = 0
  let sigma = 0
  let cosSqAlpha = 0
  let cos2SigmaM = 0
  let iterations = 0
  let lambdaPrev = 0
  const f = WGS84_F
  do {
    const sinLambda = Math.sin(lambda)
    const cosLambda = Math.cos(lambda)
    const p = cosU2 * sinLambda
    const q = cosU1 * sinU2 - sinU1 * cosU2 * cosLambda
    sinSigma = Math.sqrt(p * p + q * q)
    if (sinSigma === 0) {
      out[k] = 0 // coincident points
      return
    }
    cosSigma = sinU1 * sinU2 + cosU1 * cosU2 * cosLambda
    sigma = Math.atan2(sinSigma, cosSigma)
    const sinAlpha = (cosU1 * cosU2 * sinLambda) / sinSigma
    cosSqAlpha = 1 - sinAlpha * sinAlpha
    cos2SigmaM = cosSqAlpha !== 0 ? cosSigma - (2 * sinU1 * sinU2) / cosSqAlpha : 0 // equatorial line
    const C = (f / 16) * cosSqAlpha * (4 + f * (4 - 3 * cosSqAlpha))
    lambdaPrev = lambda
    lambda =
      L +
      (1 - C) * f * sinAlpha * (sigma + C * sinSigma * (cos2SigmaM + C * cosSigma * (-1 + 2 * cos2SigmaM * cos2SigmaM)))
  } while (Math.abs(lambda - lambdaPrev) > 1e-12 && ++iterations < 200)

  if (iterations >= 200) {
    out[k] = greatCircleFromReduced(sinU1, cosU1, sinU2, cosU2, L)
    return
  }

  const uSq = cosSqAlpha * A2_MINUS_B2_OVER_B2
  const A = 1 + (uSq / 16384) * (4096 + uSq * (-768 + uSq * (320 - 175 * uSq)))
  const B = (uSq / 1024) * (256 + uSq * (-128 + uSq * (74 - 47 * uSq)))
  const c2 = cos2SigmaM * cos2SigmaM
  const deltaSigma =
    B *
    sinSigma *
    (cos2SigmaM +
      (B / 4) * (cosSigma * (-1 + 2 * c2) - (B / 6) * cos2SigmaM * (-3 + 4 * sinSigma * sinSigma) * (-3 + 4 * c2)))
  out[k] = WGS84_B * A * (sigma - deltaSigma)
}

function greatCircleFromReduced(sinU1: number, cosU1: number, sinU2: number, cosU2: number, L: number): number {
  const c = sinU1 * sinU2 + cosU1 * cosU2 * Math.cos(L)
  return MEAN_EARTH_RADIUS_M * Math.acos(Math.max(-1, Math.min(1, c)))
}

const pairOut = new Float64Array(1)

/** Geodesic (Vincenty, WGS-84) distance in metres between two points in decimal degrees. */
export function geodesicDistanceM(lat1: number, lon1: number, lat2: number, lon2: number): number {
  vincentyInto(lat1, lon1, lat2, lon2, pairOut, 0)
  return pairOut[0]!
}

/** First eccentricity squared, e² = f (2 - f). */
const WGS84_E2 = WGS84_F * (2 - WGS84_F)
/** Steps shorter than this are measured on the ellipsoid's local metric; longer ones (a gap in the data) by Vincenty. */
const LOCAL_METRIC_MAX_M = 100
/**
 * Nor nearer a pole than this: within 100 km of one the parallels curve too fast for the local metric (3e-6 at 89.9°,
 * against 3e-8 at 89°, measured against Vincenty).
 */
const LOCAL_METRIC_MAX_LAT_RAD = 89 * DEG

/**
 * Geodesic distance in metres between slots `a` and `b` of two arrays of latitude and longitude in degrees, written
 * to `out[k]` (slots in and out: the scorer calls it per sample pair, and doubles passed to a function too big to
 * inline are boxed). A step under LOCAL_METRIC_MAX_M, below LOCAL_METRIC_MAX_LAT_RAD, is measured with the WGS-84 ellipsoid's metric at its
 * mid-latitude: ds² = (M dφ)² + (N cos φ dλ)², M and N the meridian and prime-vertical radii of curvature,
 * M = a (1 - e²) / W³ and N = a / W with W² = 1 - e² sin² φ (the textbook radii, written from memory;
 * tests/unit/scoring/geodesy.test.ts holds the result to geolib's Vincenty).
 */
export function intervalDistanceInto(
  latDeg: Float64Array,
  lonDeg: Float64Array,
  a: number,
  b: number,
  out: Float64Array,
  k: number,
): void {
  const lat1 = latDeg[a]!
  const lat2 = latDeg[b]!
  const dLon = lonDelta(lonDeg[a]!, lonDeg[b]!)
  const phi = (lat1 + lat2) * 0.5 * DEG
  const sinPhi = Math.sin(phi)
  const w2 = 1 - WGS84_E2 * sinPhi * sinPhi
  const w = Math.sqrt(w2)
  const north = ((WGS84_A * (1 - WGS84_E2)) / (w2 * w)) * (lat2 - lat1) * DEG
  const east = (WGS84_A / w) * Math.cos(phi) * dLon * DEG
  const d = Math.sqrt(north * north + east * east)
  if (d < LOCAL_METRIC_MAX_M && Math.abs(phi) < LOCAL_METRIC_MAX_LAT_RAD) {
    out[k] = d
    return
  }
  vincentyInto(lat1, lonDeg[a]!, lat2, lonDeg[b]!, out, k)
}
