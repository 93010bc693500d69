import { readdirSync, readFileSync } from "node:fs"
import path from "node:path"
import Ajv, { type ValidateFunction } from "ajv"
import fc from "fast-check"
import { describe, expect, it } from "vitest"
import { parseAnyDriveFile } from "@/lib/drive-file"
import drive1Schema from "@/lib/drive-file/schema/drive-1.schema.json"
import drive2Schema from "@/lib/drive-file/schema/drive-2.schema.json"
import { generateDrive, PATTERN_MIN_MINUTES, type DrivePattern } from "@/lib/tracks"
import { arbDrive } from "./helpers/arbitraries"
import { drive, mark, steady } from "./helpers/drive"
import { metRoadTest, roadTest, check } from "./helpers/road-test"

// The JSON Schemas of the drive file (lib/drive-file/schema) against every drive file the tests use:
// the fixture files, the generated tracks, the property-test drives and the files built in code.

// strictRequired off: the `then` branches name fields that the mark object defines beside them.
const ajv = new Ajv({ allErrors: true, strict: true, strictRequired: false })
const validate1 = ajv.compile(drive1Schema)
const validate2 = ajv.compile(drive2Schema)

const FIXTURES = path.join(__dirname, "../fixtures/drive-files")
const fixtures = readdirSync(FIXTURES)
  .filter((f) => f.endsWith(".json"))
  .map((name) => ({ name, body: JSON.parse(readFileSync(path.join(FIXTURES, name), "utf8")) as unknown }))

function errors(v: ValidateFunction): string {
  return ajv.errorsText(v.errors)
}

describe("drive file JSON Schemas", () => {
  it("has fixtures of each kind", () => {
    for (const prefix of ["valid-1-", "valid-2-", "invalid-1-", "invalid-2-"]) {
      expect(fixtures.some((f) => f.name.startsWith(prefix))).toBe(true)
    }
  })

  for (const { name, body } of fixtures) {
    const [validity, version] = name.split("-") as ["valid" | "invalid", "1" | "2"]
    const v = version === "1" ? validate1 : validate2
    const other = version === "1" ? validate2 : validate1
    it(`${validity === "valid" ? "accepts" : "refuses"} ${name} as the parser does`, () => {
      const ok = v(body)
      expect(ok, errors(v)).toBe(validity === "valid")
      expect(parseAnyDriveFile(body).ok).toBe(validity === "valid")
      // a file of one version is never a file of the other
      expect(other(body)).toBe(false)
    })
  }

  it("accepts every generated track (lib/tracks) as version 1", () => {
    for (const [pattern, min] of Object.entries(PATTERN_MIN_MINUTES) as [DrivePattern, number][]) {
      for (const opts of [{}, { speedMissingShare: 0.3 }, { dataGaps: 2 }]) {
        const file = JSON.parse(
          JSON.stringify(generateDrive({ seed: 5, minutes: Math.max(min, 16), pattern, ...opts })),
        )
        expect(validate1(file), `${pattern}: ${errors(validate1)}`).toBe(true)
      }
    }
  })

  it("accepts the property tests' drives as version 1", () => {
    for (const file of fc.sample(arbDrive, { numRuns: 40, seed: 13 })) {
      expect(validate1(JSON.parse(JSON.stringify(file))), errors(validate1)).toBe(true)
    }
  })

  it("accepts the files the unit tests build in code", () => {
    const v1 = drive(steady(30, 20), [
      mark(1, "lead-on", { gapFt: 120 }),
      mark(5, "gap", { gapFt: 130 }),
      mark(9, "note", { text: "x" }),
      mark(20, "cleared"),
    ])
    expect(validate1(JSON.parse(JSON.stringify(v1))), errors(validate1)).toBe(true)
    for (const file of [metRoadTest(), roadTest([]), roadTest([check(10, "acc-engages", "fail")])]) {
      expect(validate2(JSON.parse(JSON.stringify(file))), errors(validate2)).toBe(true)
    }
  })
})
