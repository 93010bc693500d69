import { describe, expect, it } from "vitest"
import { shopSettingsSchema } from "@/lib/validation/profile"
import { parseLocationInput, shopLocationFormSchema } from "@/lib/validation/shop-location"

describe("the shop's location as typed on the settings page", () => {
  it("reads decimal degrees, with a decimal comma too, and both empty as no location", () => {
    expect(parseLocationInput("43.8731", "-91.9187")).toEqual({ ok: true, location: { lat: 43.8731, lon: -91.9187 } })
    expect(parseLocationInput(" 43,8731 ", "-91,9187")).toEqual({ ok: true, location: { lat: 43.8731, lon: -91.9187 } })
    expect(parseLocationInput("-33.9", "151.2")).toEqual({ ok: true, location: { lat: -33.9, lon: 151.2 } })
    expect(parseLocationInput("", "  ")).toEqual({ ok: true, location: null })
  })

  it("names the field that is wrong", () => {
    expect(parseLocationInput("91", "0")).toMatchObject({ ok: false, field: "lat" })
    expect(parseLocationInput("45", "-180.5")).toMatchObject({ ok: false, field: "lon" })
    expect(parseLocationInput("45", "")).toMatchObject({ ok: false, field: "lon" })
    expect(parseLocationInput("", "-91")).toMatchObject({ ok: false, field: "lat" })
    // degrees-minutes-seconds or words are not decimal degrees
    expect(parseLocationInput("43°52'23\"N", "-91.9")).toMatchObject({ ok: false, field: "lat" })
    expect(parseLocationInput("43.8", "1e2")).toMatchObject({ ok: false, field: "lon" })
    expect(parseLocationInput("NaN", "0")).toMatchObject({ ok: false, field: "lat" })
  })
})

describe("the shop settings a PATCH may carry", () => {
  it("takes an IANA time zone name and refuses anything else", () => {
    expect(shopSettingsSchema.safeParse({ timeZone: "America/Chicago" }).success).toBe(true)
    expect(shopSettingsSchema.safeParse({ timeZone: "Europe/Berlin" }).success).toBe(true)
    expect(shopSettingsSchema.safeParse({ timeZone: "Mars/Olympus_Mons" }).success).toBe(false)
    expect(shopSettingsSchema.safeParse({ timeZone: "" }).success).toBe(false)
  })

  it("takes a location inside the globe's ranges, or null to clear it", () => {
    expect(shopSettingsSchema.safeParse({ location: { lat: 43.8731, lon: -91.9187 } }).success).toBe(true)
    expect(shopSettingsSchema.safeParse({ location: null }).success).toBe(true)
    expect(shopSettingsSchema.safeParse({ location: { lat: 90.5, lon: 0 } }).success).toBe(false)
    expect(shopSettingsSchema.safeParse({ location: { lat: 0, lon: 181 } }).success).toBe(false)
    expect(shopSettingsSchema.safeParse({ location: { lat: "43.8", lon: 0 } }).success).toBe(false)
    expect(shopSettingsSchema.safeParse({ location: { lat: 43.8 } }).success).toBe(false)
  })
})

describe("the settings page's location form schema", () => {
  it("gives the location, or null for two empty fields", () => {
    expect(shopLocationFormSchema.parse({ lat: "43,8731", lon: "-91.9187" })).toEqual({ lat: 43.8731, lon: -91.9187 })
    expect(shopLocationFormSchema.parse({ lat: " ", lon: "" })).toBeNull()
  })

  it("puts the problem on the field it belongs to", () => {
    const result = shopLocationFormSchema.safeParse({ lat: "45", lon: "-180.5" })
    expect(result.success).toBe(false)
    expect(result.error?.issues).toEqual([
      expect.objectContaining({ path: ["lon"], message: "must be between -180 and 180" }),
    ])
  })
})
