// Exact unit conversions (NIST SP 811, App. B.8): 1 ft = 0.3048 m, 1 mi = 1609.344 m,
// 1 mi/h = 0.44704 m/s, 1 km/h = 1/3.6 m/s. Factors are applied as integer ratios so that
// decimal inputs land on the nearest double of the exact decimal result (35 mph -> 15.6464).

export const MPS_PER_MPH = 0.44704
export const STANDARD_GRAVITY_MPS2 = 9.80665

/** Both directions of an exact conversion by an integer ratio: `x * num / den`, and back `x * den / num`. */
function exactRatio(num: number, den: number): [(x: number) => number, (x: number) => number] {
  return [(x) => (x * num) / den, (x) => (x * den) / num]
}

export const [mphToMps, mpsToMph] = exactRatio(44704, 100000)
export const [ftToM, mToFt] = exactRatio(3048, 10000)
export const [miToM, mToMi] = exactRatio(1609344, 1000)

export function kmhToMps(kmh: number): number {
  return kmh / 3.6
}

export function mpsToKmh(mps: number): number {
  return mps * 3.6
}

export function gToMps2(g: number): number {
  return g * STANDARD_GRAVITY_MPS2
}
