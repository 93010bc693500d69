import { describe, expect, it } from "vitest"
import { ftToM, gToMps2, kmhToMps, miToM, mpsToKmh, mpsToMph, mToFt, mToMi, mphToMps } from "@/lib/units"

describe("units", () => {
  // NIST SP 811, App. B.8: 1 mi/h = 0.44704 m/s exactly
  it("converts mph to m/s exactly (NIST SP 811 B.8: 35 mph = 15.6464, 60 mph = 26.8224, 55 mph = 24.5872 m/s)", () => {
    expect(mphToMps(1)).toBe(0.44704)
    expect(mphToMps(35)).toBe(15.6464)
    expect(mphToMps(60)).toBe(26.8224)
    expect(mphToMps(55)).toBe(24.5872)
  })

  it("converts m/s back to mph (NIST SP 811 B.8)", () => {
    expect(mpsToMph(15.6464)).toBe(35)
    expect(mpsToMph(26.8224)).toBe(60)
    expect(mpsToMph(mphToMps(47.3))).toBeCloseTo(47.3, 12)
  })

  // NIST SP 811, App. B.8: 1 ft = 0.3048 m exactly
  it("converts feet and metres exactly (NIST SP 811 B.8: 1 ft = 0.3048 m)", () => {
    expect(ftToM(1)).toBe(0.3048)
    expect(ftToM(100)).toBe(30.48)
    expect(mToFt(0.3048)).toBeCloseTo(1, 12)
    expect(mToFt(30.48)).toBe(100)
  })

  it("converts miles exactly (NIST SP 811 B.8: 1 mi = 1609.344 m)", () => {
    expect(miToM(1)).toBe(1609.344)
    expect(mToMi(1609.344)).toBe(1)
  })

  it("converts km/h as v / 3.6 (NIST SP 811 B.8: km and h are exact)", () => {
    expect(kmhToMps(100)).toBe(100 / 3.6)
    expect(mpsToKmh(kmhToMps(100))).toBeCloseTo(100, 12)
  })

  it("converts g using standard gravity 9.80665 m/s² (NIST SP 330 / CODATA, exact)", () => {
    expect(gToMps2(0.3)).toBeCloseTo(2.941995, 9)
    expect(gToMps2(0.45)).toBeCloseTo(4.4129925, 9)
  })
})
