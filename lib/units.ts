// Exact unit conversions (NIST SP 811, App. B.8): 1 ft = 0.3048 m, 1 mi = 1609.344 m,
// 1 mi/h = 0.44704 m/s, 1 km/h = 1/3.6 m/s. Factors are applied as integer ratios so that
// decimal inputs land on the nearest double of the exact decimal result (35 mph -> 15.6464).

export const MPS_PER_MPH = 0.44704
export const STANDARD_GRAVITY_MPS2 = 9.80665

export function mphToMps(mph: number): number {
  return (mph * 44704) / 100000
}

export function mpsToMph(mps: number): number {
  return (mps * 100000) / 44704
}

export function ftToM(ft: number): number {
  return (ft * 3048) / 10000
}

export function mToFt(m: number): number {
  return (m * 10000) / 3048
}

export function miToM(mi: number): number {
  return (mi * 1609344) / 1000
}

export function mToMi(m: number): number {
  return (m * 1000) / 1609344
}

export function kmhToMps(kmh: number): number {
  return kmh / 3.6
}

export function mpsToKmh(mps: number): number {
  return mps * 3.6
}

export function gToMps2(g: number): number {
  return g * STANDARD_GRAVITY_MPS2
}
