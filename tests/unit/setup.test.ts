import { describe, expect, it } from "vitest"
import {
  describeMeasurement,
  isOutOfTolerance,
  setupFieldsOnFormRows,
  setupFormSchema,
  setupInputSchema,
  setupOverrideSchema,
  type SetupFormRow,
} from "@/lib/setup"

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

  describe("the set-up form's text boxes", () => {
    const row = (figures: Partial<SetupFormRow> = {}): SetupFormRow => ({
      key: "target_distance",
      label: "",
      value: "",
      specified: "",
      tolerance: "",
      unit: "mm",
      ...figures,
    })

    it("reads the figures into the API's body: blank rows left out, a decimal comma read as a point", () => {
      const r = setupFormSchema.safeParse({
        measurements: [
          row(),
          row({ value: "1502,5", specified: "1500", tolerance: " 10 ", unit: " mm " }),
          row({ key: "other", label: " Bracket angle ", value: "-0.4", specified: "0", tolerance: "0.5", unit: "°" }),
        ],
        scanResult: "pass",
        scanNotes: "  none stored ",
      })
      expect(r.success && r.data).toEqual({
        measurements: [
          { key: "target_distance", value: 1502.5, specified: 1500, tolerance: 10, unit: "mm" },
          { key: "other", label: "Bracket angle", value: -0.4, specified: 0, tolerance: 0.5, unit: "°" },
        ],
        scanResult: "pass",
        scanNotes: "none stored",
      })
      // The output is a body the API takes as it is.
      expect(r.success && setupInputSchema.parse(r.data)).toEqual(r.success && r.data)
    })

    it("puts the API's own problems on the form's rows, counting the blank ones", () => {
      const r = setupFormSchema.safeParse({
        measurements: [
          row(),
          row({ value: "15o2", specified: "1500", tolerance: "10" }),
          row({ key: "other", value: "1", specified: "1", tolerance: "-1" }),
        ],
        scanResult: "fail",
        scanNotes: "",
      })
      expect(r.success).toBe(false)
      const problems = r.success ? {} : Object.fromEntries(r.error.issues.map((i) => [i.path.join("."), i.message]))
      expect(problems).toEqual({
        "measurements.1.value": "must be a number",
        "measurements.2.tolerance": "must be 0 or more",
        "measurements.2.label": "is required for an other measurement",
      })
    })

    it("moves the API's field problems from the body's measurements to the form's rows", () => {
      // Rows 1 and 3 of the form were sent as measurements 0 and 1.
      expect(
        setupFieldsOnFormRows(
          {
            "measurements.1.unit": "must not contain the NUL character",
            measurements: "must hold at most 30",
            scanNotes: "x",
          },
          [1, 3],
        ),
      ).toEqual({
        "measurements.3.unit": "must not contain the NUL character",
        measurements: "must hold at most 30",
        scanNotes: "x",
      })
    })
  })
})
