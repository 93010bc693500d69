import { describe, expect, it } from "vitest"
import { describeMeasurement, isOutOfTolerance, setupInputSchema, setupOverrideSchema } from "@/lib/setup"

// Set-up figures are the shop's entries from the maker's service information; these checks use invented values.
describe("static set-up measurements", () => {
  it("is out of tolerance only beyond specified ± tolerance (the limits themselves are in)", () => {
    expect(isOutOfTolerance({ value: 1510, specified: 1500, tolerance: 10 })).toBe(false)
    expect(isOutOfTolerance({ value: 1490, specified: 1500, tolerance: 10 })).toBe(false)
    expect(isOutOfTolerance({ value: 1510.5, specified: 1500, tolerance: 10 })).toBe(true)
    expect(isOutOfTolerance({ value: -0.2, specified: 0, tolerance: 0.1 })).toBe(true)
    // decimal input: 0.1 + 0.2 is not exactly 0.3 in binary floating point, and must still read as in tolerance
    expect(isOutOfTolerance({ value: 0.1 + 0.2, specified: 0, tolerance: 0.3 })).toBe(false)
  })

  it("describes a figure with its specified value and tolerance", () => {
    expect(
      describeMeasurement({ key: "target_distance", value: 1530, specified: 1500, tolerance: 10, unit: "mm" }),
    ).toBe("Target distance 1530 mm (specified 1500 ± 10 mm)")
    expect(
      describeMeasurement({
        key: "other",
        label: "Radar bracket angle",
        value: 1.2,
        specified: 0,
        tolerance: 1,
        unit: "°",
      }),
    ).toBe("Radar bracket angle 1.2 ° (specified 0 ± 1 °)")
  })

  it("refuses an other measurement without a name, a negative tolerance and an empty override note", () => {
    const r = setupInputSchema.safeParse({
      measurements: [{ key: "other", value: 1, specified: 1, tolerance: -1, unit: "mm" }],
      scanResult: "pass",
    })
    expect(r.success).toBe(false)
    const paths = r.success ? [] : r.error.issues.map((i) => i.path.join("."))
    expect(paths).toEqual(expect.arrayContaining(["measurements.0.tolerance", "measurements.0.label"]))
    expect(setupOverrideSchema.safeParse({ note: "  " }).success).toBe(false)
    expect(setupOverrideSchema.safeParse({ note: "Checked against the printout" }).success).toBe(true)
  })
})
