import fc from "fast-check"
import { describe, expect, it } from "vitest"

import { vinSchema } from "@/lib/validation/vin"
import {
  checkVin,
  computeCheckDigit,
  computeWeightedSum,
  decodeModelYear,
  modelYearChoices,
  POSITION_WEIGHTS,
  transliterate,
  withCheckDigit,
} from "@/lib/vin"

// 49 CFR 565 "Assigned Values" table, written here independently of lib/vin.ts (check-values.md §2a), in the
// table's own runs: digits keep their value, A–H are 1–8, J–N are 1–5, P is 7, R is 9, S–Z are 2–9 (no I, O, Q).
const run = (letters: string, first: number) => [...letters].map((c, i) => [c, first + i] as const)
const CFR_VALUES: Record<string, number> = Object.fromEntries([
  ...run("0123456789", 0),
  ...run("ABCDEFGH", 1),
  ...run("JKLMN", 1),
  ["P", 7],
  ["R", 9],
  ...run("STUVWXYZ", 2),
])
const LEGAL = Object.keys(CFR_VALUES)

function replaceAt(vin: string, position: number, char: string): string {
  return vin.slice(0, position - 1) + char + vin.slice(position)
}

// check-values.md §2b: VIN, weighted sum, check digit, source.
const PUBLISHED_VINS = [
  // NHTSA, Outline for New Manufacturer Information p.18: 1J9RP1A36A1644345, sum 314, check 6
  { vin: "1J9RP1A36A1644345", sum: 314, check: "6" },
  // 49 CFR 565 Table V "Calculation of a Check Digit": 1G4AH59H?5G118341, sum 411, check 4
  { vin: "1G4AH59H45G118341", sum: 411, check: "4" },
  // 49 CFR 565 sample, later edition (quoted at vsource.org, myvindecoder.com): JH2RC360?MM101581, sum 280, check 5
  { vin: "JH2RC3605MM101581", sum: 280, check: "5" },
  // forum worked example and the is_vin PHP library's test VIN: sum 351, remainder 10, check X
  { vin: "1M8GDM9AXKP042788", sum: 351, check: "X" },
  // datacleaner/extension_vehicles wiki: 1FACP45E?LF192944, sum 373, remainder 10, check X
  { vin: "1FACP45EXLF192944", sum: 373, check: "X" },
  // 5y1.org "VIN Check Digit, the 9th Position": sum 369, check 6
  { vin: "1G1BN53E6NW128495", sum: 369, check: "6" },
  // R package vindecodr example ("True"): sum 355, check 3
  { vin: "WDBEA30D3HA391172", sum: 355, check: "3" },
  // Ruby gem vindicator doc example: sum 428, remainder 10, check X
  { vin: "1GNEC233X9R191831", sum: 428, check: "X" },
]

describe("49 CFR 565 tables", () => {
  it("assigns the Table III values to every legal character, and none to I, O or Q", () => {
    for (const char of LEGAL) expect(transliterate(char), char).toBe(CFR_VALUES[char])
    for (const char of ["I", "O", "Q", "-", " ", "a", ""]) expect(transliterate(char), char).toBeNull()
  })

  it("avoids the classic transliteration slips P=6, R=8, S=1", () => {
    // 49 CFR 565 Table III: P=7, R=9, S=2 (the sequence skips Q and restarts at S)
    expect([transliterate("P"), transliterate("R"), transliterate("S")]).toEqual([7, 9, 2])
  })

  it("weights positions 1-17 as Table IV", () => {
    // 49 CFR 565 Table IV "VIN Position and Weight Factor"
    expect(POSITION_WEIGHTS).toEqual([8, 7, 6, 5, 4, 3, 2, 10, 0, 9, 8, 7, 6, 5, 4, 3, 2])
  })
})

describe("checkVin on published VINs", () => {
  it.each(PUBLISHED_VINS)("validates $vin (sum $sum, check $check)", ({ vin, sum, check }) => {
    expect(computeWeightedSum(vin)).toBe(sum)
    expect(sum % 11).toBe(check === "X" ? 10 : Number(check))
    expect(computeCheckDigit(vin)).toBe(check)
    expect(checkVin(vin)).toMatchObject({
      vin,
      valid: true,
      checkDigit: check,
      expectedCheckDigit: check,
      problems: [],
    })
  })

  it("fills the CFR samples' blank check digit", () => {
    // 49 CFR 565 Table V: 1G4AH59H?5G118341 -> 4
    expect(withCheckDigit("1G4AH59H?5G118341")).toBe("1G4AH59H45G118341")
    // 49 CFR 565 sample, later edition: JH2RC360?MM101581 -> 5
    expect(withCheckDigit("JH2RC360?MM101581")).toBe("JH2RC3605MM101581")
    // datacleaner/extension_vehicles wiki: 1FACP45E?LF192944 -> X (remainder 10)
    expect(withCheckDigit("1FACP45E?LF192944")).toBe("1FACP45EXLF192944")
  })

  it("ignores whatever stands in position 9 when computing the check digit (weight 0)", () => {
    for (const filler of ["0", "X", "?", "_"]) {
      expect(computeCheckDigit(replaceAt("1J9RP1A36A1644345", 9, filler))).toBe("6")
    }
  })
})

describe("single-character changes", () => {
  it.each(PUBLISHED_VINS)("rejects every change of $vin to a character of a different value", ({ vin }) => {
    let mutations = 0
    for (let position = 1; position <= 17; position++) {
      const original = vin[position - 1]!
      for (const char of LEGAL) {
        if (char === original) continue
        // Off position 9, a letter of equal value leaves the sum unchanged: only different values must fail.
        if (position !== 9 && CFR_VALUES[char] === CFR_VALUES[original]) continue
        const mutated = replaceAt(vin, position, char)
        const result = checkVin(mutated)
        expect(result.valid, mutated).toBe(false)
        if (position !== 9) expect(result.expectedCheckDigit, mutated).not.toBe(vin[8])
        mutations++
      }
    }
    expect(mutations).toBeGreaterThan(400)
  })

  it("keeps the check digit when a letter is swapped for one of equal value", () => {
    // 49 CFR 565 Table III: A=J=1, so 1J9RP1A36A1644345 with position 7 J still sums to 314
    const swapped = replaceAt("1J9RP1A36A1644345", 7, "J")
    expect(computeWeightedSum(swapped)).toBe(314)
    expect(checkVin(swapped).valid).toBe(true)
  })

  it("catches a random single substitution in any VIN built with withCheckDigit", () => {
    const legalChar = fc.constantFrom(...LEGAL)
    fc.assert(
      fc.property(
        fc.array(legalChar, { minLength: 17, maxLength: 17 }),
        fc.integer({ min: 1, max: 17 }).filter((p) => p !== 9),
        legalChar,
        (chars, position, replacement) => {
          const vin = withCheckDigit(chars.join(""))
          const result = checkVin(vin)
          expect(result.expectedCheckDigit).toBe(result.checkDigit)
          expect(result.problems.some((p) => p.startsWith("Position 9"))).toBe(false)

          const original = vin[position - 1]!
          fc.pre(CFR_VALUES[replacement] !== CFR_VALUES[original])
          const mutated = checkVin(replaceAt(vin, position, replacement))
          expect(mutated.valid).toBe(false)
          expect(mutated.expectedCheckDigit).not.toBe(mutated.checkDigit)
        },
      ),
      { numRuns: 500 },
    )
  })
})

describe("malformed VINs", () => {
  it("names a wrong check digit in plain words", () => {
    const result = checkVin("1J9RP1A37A1644345")
    expect(result).toMatchObject({ valid: false, checkDigit: "7", expectedCheckDigit: "6", modelYear: 2010 })
    expect(result.problems).toEqual(["Position 9 is 7 but the check digit works out to 6."])
  })

  it.each(["I", "O", "Q"])("rejects the letter %s", (letter) => {
    // 49 CFR 565.4(g): I, O and Q are not used
    const result = checkVin(replaceAt("1J9RP1A36A1644345", 5, letter))
    expect(result.valid).toBe(false)
    expect(result.problems).toContain(`Letters I, O and Q are never used in a VIN (position 5 is ${letter}).`)
    expect(result.expectedCheckDigit).toBeNull()
  })

  it("names every I, O or Q it finds", () => {
    const result = checkVin("1J9RO1A36A1644I45")
    expect(result.problems[0]).toBe("Letters I, O and Q are never used in a VIN (position 5 is O; position 15 is I).")
  })

  it("still works out the check digit when only position 9 is mistyped as a letter", () => {
    const result = checkVin("1G4AH59HO5G118341")
    expect(result.expectedCheckDigit).toBe("4")
    expect(result.problems).toEqual([
      "Letters I, O and Q are never used in a VIN (position 9 is O).",
      "Position 9 is O but the check digit works out to 4.",
    ])
  })

  it.each([
    ["1J9RP1A36A164434", 16],
    ["1J9RP1A36A16443451", 18],
    ["1", 1],
  ])("rejects %s for its length", (vin, length) => {
    // 49 CFR 565.4(b): a VIN has 17 characters
    const result = checkVin(vin)
    expect(result).toMatchObject({ valid: false, checkDigit: null, expectedCheckDigit: null, modelYear: null })
    expect(result.problems[0]).toBe(`VIN has ${length} character${length === 1 ? "" : "s"}; it needs 17.`)
  })

  it("says so when nothing was entered", () => {
    expect(checkVin("   ").problems).toEqual(["No VIN was entered; it needs 17 characters."])
  })

  it("names punctuation and spaces by position", () => {
    const result = checkVin("1J9-P1A36A16 4345")
    expect(result.valid).toBe(false)
    expect(result.problems).toEqual([
      'A VIN holds only digits and capital letters (position 4 is "-"; position 13 is a space).',
    ])
  })

  it("never throws, whatever it is given", () => {
    const inputs = ["", "\u00e9".repeat(17), "x".repeat(10_000), "1j9rp1a36a1644345\n", undefined, null, 17]
    for (const input of inputs) {
      const result = checkVin(input as unknown as string)
      expect(typeof result.valid).toBe("boolean")
      expect(Array.isArray(result.problems)).toBe(true)
    }
    fc.assert(
      fc.property(fc.string({ maxLength: 40 }), (input) => {
        const result = checkVin(input)
        expect(result.valid).toBe(result.problems.length === 0)
      }),
    )
  })

  it("normalises lowercase and surrounding blanks", () => {
    const result = checkVin("  1j9rp1a36a1644345\t")
    expect(result).toMatchObject({ vin: "1J9RP1A36A1644345", valid: true, modelYear: 2010 })
  })

  it("refuses to compute a check digit for a VIN it cannot weigh", () => {
    expect(() => computeCheckDigit("1J9RP1A36A164434")).toThrow(RangeError)
    expect(() => computeCheckDigit("1J9RO1A36A1644345")).toThrow(/Position 5/)
    expect(() => withCheckDigit("ABC")).toThrow(RangeError)
  })
})

describe("model year (position 10)", () => {
  // 49 CFR 565 year-code table (check-values.md §2c): code, year in the 1980 cycle, year in the 2010 cycle.
  const YEAR_CODES: [string, number, number][] = [
    ["A", 1980, 2010],
    ["B", 1981, 2011],
    ["C", 1982, 2012],
    ["D", 1983, 2013],
    ["E", 1984, 2014],
    ["F", 1985, 2015],
    ["G", 1986, 2016],
    ["H", 1987, 2017],
    ["J", 1988, 2018],
    ["K", 1989, 2019],
    ["L", 1990, 2020],
    ["M", 1991, 2021],
    ["N", 1992, 2022],
    ["P", 1993, 2023],
    ["R", 1994, 2024],
    ["S", 1995, 2025],
    ["T", 1996, 2026],
    ["V", 1997, 2027],
    ["W", 1998, 2028],
    ["X", 1999, 2029],
    ["Y", 2000, 2030],
    ["1", 2001, 2031],
    ["2", 2002, 2032],
    ["3", 2003, 2033],
    ["4", 2004, 2034],
    ["5", 2005, 2035],
    ["6", 2006, 2036],
    ["7", 2007, 2037],
    ["8", 2008, 2038],
    ["9", 2009, 2039],
  ]

  it("reads 1J9RP1A36A1644345 as 2010", () => {
    // 49 CFR 565.15(b) + year table: position 7 'A' (alphabetic) and code 'A' -> 2010
    expect(decodeModelYear("1J9RP1A36A1644345")).toBe(2010)
    expect(checkVin("1J9RP1A36A1644345").modelYear).toBe(2010)
  })

  it.each([
    // Derived from the year table with a numeric position 7 -> 1980-2009
    ["1G1BN53E6NW128495", 1992],
    ["1G4AH59H45G118341", 2005],
    ["JH2RC3605MM101581", 1991],
    ["WDBEA30D3HA391172", 1987],
    ["1GNEC233X9R191831", 2009],
  ])("reads %s (numeric position 7) as %i", (vin, year) => {
    expect(checkVin(vin).modelYear).toBe(year)
  })

  it.each(YEAR_CODES)("decodes code %s as %i or %i by position 7", (code, year1980, year2010) => {
    const numeric7 = withCheckDigit(replaceAt("1G1BN53E6NW128495", 10, code)) // position 7 is '3'
    const alpha7 = withCheckDigit(replaceAt("1J9RP1A36A1644345", 10, code)) // position 7 is 'A'
    expect(checkVin(numeric7)).toMatchObject({ valid: true, modelYear: year1980 })
    expect(checkVin(alpha7)).toMatchObject({ valid: true, modelYear: year2010 })
  })

  it.each(["U", "Z", "0"])("gives no year for %s in position 10 and says why", (code) => {
    // 49 CFR 565 year table: U, Z and 0 are never year codes
    const vin = withCheckDigit(replaceAt("1J9RP1A36A1644345", 10, code))
    const result = checkVin(vin)
    expect(result.expectedCheckDigit).toBe(result.checkDigit)
    expect(result).toMatchObject({ valid: false, modelYear: null })
    expect(result.problems).toEqual([
      `Position 10 is ${code}, which is not a model-year code (U, Z and 0 are never used there).`,
    ])
    expect(decodeModelYear(vin)).toBeNull()
  })

  it("gives no year for I, O or Q in position 10", () => {
    expect(decodeModelYear(replaceAt("1J9RP1A36A1644345", 10, "O"))).toBeNull()
  })

  it("gives no year when the VIN is the wrong length", () => {
    expect(decodeModelYear("1J9RP1A36A164434")).toBeNull()
  })
})

describe("vinSchema", () => {
  it("accepts a valid VIN and returns it normalised", () => {
    expect(vinSchema.parse(" 1j9rp1a36a1644345 ")).toBe("1J9RP1A36A1644345")
  })

  it("rejects a bad VIN with the first problem as its message", () => {
    const parsed = vinSchema.safeParse("1J9RP1A37A1644345")
    expect(parsed.success).toBe(false)
    expect(parsed.error?.issues[0]?.message).toBe("Position 9 is 7 but the check digit works out to 6.")
  })

  it("rejects a short VIN by its length first", () => {
    const parsed = vinSchema.safeParse("1J9RP1A36A16443O")
    expect(parsed.error?.issues[0]?.message).toBe("VIN has 16 characters; it needs 17.")
  })
})

describe("model years position 7 cannot settle", () => {
  // 49 CFR 565 year-code table (30-year cycle from 1980) and §565.15(b): position 7 decides the cycle only for
  // cars, MPVs and trucks up to 4536 kg GVWR, so a heavier vehicle's position 10 can mean either cycle.
  it("offers both years of position 10's code, the light-vehicle reading first", () => {
    const vin = "1J9RP1A36A1644345" // published example above: A with alphabetic position 7 -> 2010
    expect(modelYearChoices(vin, 2026)).toEqual([2010, 1980])
    expect(checkVin(vin).modelYearChoices[0]).toBe(2010)
  })

  it("leaves out a year still to come (a model year runs at most one year ahead)", () => {
    // Position 10 "Y" is 2000 or 2030; with a numeric position 7 the light-vehicle reading is 2000.
    const numeric7 = withCheckDigit("1Z9ZZ1199YZ000001")
    expect(modelYearChoices(numeric7, 2026)).toEqual([2000])
    // "T" is 1996 or 2026: both have come by 2026
    const alpha7 = withCheckDigit("1Z9ZZ1A99TZ000001")
    expect(modelYearChoices(alpha7, 2026)).toEqual([2026, 1996])
    expect(modelYearChoices(alpha7, 2024)).toEqual([1996])
  })

  it("offers nothing when position 10 is not a year code", () => {
    expect(modelYearChoices(withCheckDigit("1Z9ZZ1A99UZ000001"), 2026)).toEqual([])
  })
})
