import { describe, expect, it } from "vitest"
import { DEFAULT_PROFILE, resolveProfile } from "@/lib/drive-file"
import { defaultRoadTestChecks } from "@/lib/drive-file/road-test"
import { nextProfileVersion } from "@/lib/profiles/versioning"

const current = { settings: resolveProfile({}), roadTestChecks: defaultRoadTestChecks("forward_radar") }

describe("profile versions", () => {
  it("starts from a sensor with road-test checks", () => {
    expect(current.roadTestChecks.length).toBeGreaterThan(0)
  })

  it("makes no version when neither settings nor road-test checks are sent", () => {
    expect(nextProfileVersion(current, {})).toBeNull()
  })

  it("makes no version when the settings sent resolve to the current ones (a form saved as it was)", () => {
    expect(nextProfileVersion(current, { settings: { ...DEFAULT_PROFILE } })).toBeNull()
    expect(nextProfileVersion(current, { roadTestChecks: [...current.roadTestChecks] })).toBeNull()
  })

  it("makes a version with the changed settings and keeps the current road-test checks", () => {
    const next = nextProfileVersion(current, { settings: { minSpeedMph: DEFAULT_PROFILE.minSpeedMph + 5 } })
    expect(next?.settings.minSpeedMph).toBe(DEFAULT_PROFILE.minSpeedMph + 5)
    expect(next?.roadTestChecks).toEqual(current.roadTestChecks)
  })

  it("makes a version when only the road-test checks change", () => {
    const next = nextProfileVersion(current, { roadTestChecks: [] })
    expect(next).toEqual({ settings: current.settings, roadTestChecks: [] })
  })
})
