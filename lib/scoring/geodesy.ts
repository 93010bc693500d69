// Vincenty's inverse formula on the WGS-84 ellipsoid (T. Vincenty, Survey Review 23(176), 1975),
// the same method and constants as geolib's getPreciseDistance. We keep our own copy because the
// scorer calls it once per sample pair (36,000 times an hour at 10 Hz): the reduced latitude of
// each point is computed once and shared by the two intervals that touch it, and nothing is
// allocated per call. Tests hold it to geolib and to the published Vincenty example.

export const WGS84_A = 6378137
export const WGS84_F = 1 / 298.257223563
const WGS84_B = WGS84_A * (1 - WGS84_F) // 6356752.314245...
/** IUGG mean radius (2a + b) / 3, used only when Vincenty does not converge (near-antipodal points). */
const MEAN_EARTH_RADIUS_M = (2 * WGS84_A + WGS84_B) / 3

const DEG = Math.PI / 180
const A2_MINUS_B2_OVER_B2 = (WGS84_A * WGS84_A - WGS84_B * WGS84_B) / (WGS84_B * WGS84_B)

/** sin and cos of the reduced latitude U = atan((1 - f) tan φ). */
export function reducedLatitude(latDeg: number, out: { sinU: number; cosU: number }): void {
  const phi = latDeg * DEG
  // Written with sin/cos rather than tan so that φ = ±90° stays finite.
  const y = (1 - WGS84_F) * Math.sin(phi)
  const x = Math.cos(phi)
  const r = Math.sqrt(x * x + y * y)
  out.sinU = y / r
  out.cosU = x / r
}

/**
 * Geodesic distance in metres between two points given by their reduced-latitude sine/cosine and
 * longitude in degrees. Returns the great-circle distance on the mean sphere when the iteration
 * fails to converge (only for nearly antipodal points, never between consecutive GPS fixes).
 */
export function vincentyFromReduced(
  sinU1: number,
  cosU1: number,
  lon1Deg: number,
  sinU2: number,
  cosU2: number,
  lon2Deg: number,
): number {
  let dLon = lon2Deg - lon1Deg
  if (dLon > 180) dLon -= 360
  else if (dLon < -180) dLon += 360
  const L = dLon * DEG
  let lambda = L
  let sinSigma = 0
  let cosSigma = 0
  let sigma = 0
  let cosSqAlpha = 0
  let cos2SigmaM = 0
  let iterations = 0
  let lambdaPrev: number
  const f = WGS84_F
  do {
    const sinLambda = Math.sin(lambda)
    const cosLambda = Math.cos(lambda)
    const p = cosU2 * sinLambda
    const q = cosU1 * sinU2 - sinU1 * cosU2 * cosLambda
    sinSigma = Math.sqrt(p * p + q * q)
    if (sinSigma === 0) return 0 // coincident points
    cosSigma = sinU1 * sinU2 + cosU1 * cosU2 * cosLambda
    sigma = Math.atan2(sinSigma, cosSigma)
    const sinAlpha = (cosU1 * cosU2 * sinLambda) / sinSigma
    cosSqAlpha = 1 - sinAlpha * sinAlpha
    cos2SigmaM = cosSqAlpha !== 0 ? cosSigma - (2 * sinU1 * sinU2) / cosSqAlpha : 0 // equatorial line
    const C = (f / 16) * cosSqAlpha * (4 + f * (4 - 3 * cosSqAlpha))
    lambdaPrev = lambda
    lambda =
      L +
      (1 - C) *
        f *
        sinAlpha *
        (sigma + C * sinSigma * (cos2SigmaM + C * cosSigma * (-1 + 2 * cos2SigmaM * cos2SigmaM)))
  } while (Math.abs(lambda - lambdaPrev) > 1e-12 && ++iterations < 200)

  if (iterations >= 200) return greatCircleFromReduced(sinU1, cosU1, sinU2, cosU2, L)

  const uSq = cosSqAlpha * A2_MINUS_B2_OVER_B2
  const A = 1 + (uSq / 16384) * (4096 + uSq * (-768 + uSq * (320 - 175 * uSq)))
  const B = (uSq / 1024) * (256 + uSq * (-128 + uSq * (74 - 47 * uSq)))
  const c2 = cos2SigmaM * cos2SigmaM
  const deltaSigma =
    B *
    sinSigma *
    (cos2SigmaM +
      (B / 4) *
        (cosSigma * (-1 + 2 * c2) - (B / 6) * cos2SigmaM * (-3 + 4 * sinSigma * sinSigma) * (-3 + 4 * c2)))
  return WGS84_B * A * (sigma - deltaSigma)
}

function greatCircleFromReduced(sinU1: number, cosU1: number, sinU2: number, cosU2: number, L: number): number {
  const c = sinU1 * sinU2 + cosU1 * cosU2 * Math.cos(L)
  return MEAN_EARTH_RADIUS_M * Math.acos(Math.max(-1, Math.min(1, c)))
}

const r1 = { sinU: 0, cosU: 0 }
const r2 = { sinU: 0, cosU: 0 }

/** Geodesic (Vincenty, WGS-84) distance in metres between two points in decimal degrees. */
export function geodesicDistanceM(lat1: number, lon1: number, lat2: number, lon2: number): number {
  reducedLatitude(lat1, r1)
  reducedLatitude(lat2, r2)
  return vincentyFromReduced(r1.sinU, r1.cosU, lon1, r2.sinU, r2.cosU, lon2)
}
