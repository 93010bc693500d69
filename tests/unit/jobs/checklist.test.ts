import { describe, expect, it } from "vitest"
import { alignmentRequired, assessChecklist, checkTires, KPA_PER_PSI, kpaToPsi, psiToKpa } from "@/lib/checklist"
import { checklistSchema, type ChecklistData } from "@/lib/validation/checklist"
import { checklistBody } from "../../helpers/checklist"

const base: ChecklistData = checklistBody({ fuelLevel: "1/2", alignmentChecked: null })
const driveTask = { method: "dynamic", reason: "bumper_or_grille_work" }

describe("pressure units", () => {
  it("1 psi = 6.894757293168 kPa (derived: 1 lbf = 4.4482216152605 N exactly, 1 in = 0.0254 m exactly; NIST SP 811 B.8 rounds to 6.894757)", () => {
    expect(KPA_PER_PSI).toBeCloseTo(6.894757293168, 12)
    expect(psiToKpa(1)).toBeCloseTo(6.894757, 6)
  })
  it("35 psi is 241.3165 kPa and back (derived from the same exact definitions)", () => {
    expect(psiToKpa(35)).toBeCloseTo(241.31650526, 6)
    expect(kpaToPsi(psiToKpa(35))).toBeCloseTo(35, 12)
  })
})

describe("checkTires", () => {
  it("passes a wheel exactly at the tolerance and flags one past it, either way", () => {
    const checks = checkTires({ unit: "psi", placard: 35, fl: 38, fr: 32, rl: 38.1, rr: 31.9 }, 3)
    expect(checks.map((c) => c.ok)).toEqual([true, true, false, false])
    expect(checks[2]!.difference).toBeCloseTo(3.1, 9)
  })
  it("converts the psi tolerance to kPa when the readings are in kPa", () => {
    // 3 psi = 20.684 kPa
    const checks = checkTires({ unit: "kPa", placard: 240, fl: 260.6, fr: 260.7, rl: 219.4, rr: 219.3 }, 3)
    expect(checks.map((c) => c.ok)).toEqual([true, false, true, false])
  })
})

describe("assessChecklist", () => {
  it("is ready when every check passes", () => {
    expect(assessChecklist(base, driveTask, 3)).toMatchObject({ ready: true, blockers: [] })
  })

  it("names each blocking check", () => {
    const a = assessChecklist(
      {
        ...base,
        faultCodes: { none: false, expected: [] },
        loadNormal: false,
        fuelLevel: "reserve",
        sensorClean: false,
        mountUndamaged: false,
        tires: { ...base.tires, fl: 30 },
      },
      driveTask,
      3,
    )
    expect(a.ready).toBe(false)
    expect(a.blockers.map((b) => b.key)).toEqual([
      "faultCodes",
      "tires.fl",
      "loadNormal",
      "fuelLevel",
      "sensorClean",
      "mountUndamaged",
    ])
    expect(a.blockers[1]!.message).toMatch(/Front left tire is 5 psi under the placard/)
  })

  it("lets listed expected fault codes through", () => {
    expect(assessChecklist({ ...base, faultCodes: { none: false, expected: ["U0415"] } }, driveTask).ready).toBe(true)
  })

  it("asks for the alignment check after an alignment or for a static set-up (common practice, no source)", () => {
    expect(alignmentRequired({ method: "dynamic", reason: "wheel_alignment" })).toBe(true)
    expect(alignmentRequired({ method: "static", reason: "replaced" })).toBe(true)
    expect(alignmentRequired({ method: "both", reason: "replaced" })).toBe(true)
    expect(alignmentRequired(driveTask)).toBe(false)
    const task = { method: "dynamic", reason: "wheel_alignment" }
    expect(assessChecklist(base, task).blockers.map((b) => b.key)).toEqual(["alignmentChecked"])
    expect(assessChecklist({ ...base, alignmentChecked: false }, task).ready).toBe(false)
    expect(assessChecklist({ ...base, alignmentChecked: true }, task).ready).toBe(true)
  })
})

describe("checklistSchema", () => {
  it("takes form strings for pressures and refuses empty or negative ones", () => {
    const ok = checklistSchema.safeParse({
      ...base,
      tires: { unit: "psi", placard: "35", fl: "35.5", fr: 35, rl: 35, rr: 35 },
    })
    expect(ok.success && ok.data.tires.fl).toBe(35.5)
    const bad = checklistSchema.safeParse({
      ...base,
      tires: { unit: "psi", placard: "", fl: -1, fr: 35, rl: 35, rr: 35 },
    })
    expect(bad.success).toBe(false)
    expect(bad.error?.issues.map((i) => i.path.join("."))).toEqual(["tires.placard", "tires.fl"])
  })
  it("refuses codes listed beside 'none'", () => {
    expect(checklistSchema.safeParse({ ...base, faultCodes: { none: true, expected: ["U0100"] } }).success).toBe(false)
  })
})
