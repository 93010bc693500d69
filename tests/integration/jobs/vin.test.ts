import { beforeAll, describe, expect, it } from "vitest"
import { createTestShop, type TestShop } from "../../helpers/db"
import { ApiClient, signedIn } from "../../helpers/http"

let shop: TestShop
beforeAll(async () => {
  shop = await createTestShop("Vin")
})

describe("GET /api/vin/:vin", () => {
  // Worked examples from shared/reference/check-values.md §2b (49 CFR 565 check digit)
  it.each([
    ["1J9RP1A36A1644345", "6", 2010], // NHTSA, Outline for New Manufacturer Information; year code A with position 7 'A' -> 2010
    ["1G4AH59H45G118341", "4", 2005], // 49 CFR 565 Table V sample; position 7 '5' numeric, year code 5 -> 2005
    ["JH2RC3605MM101581", "5", 1991], // 49 CFR 565 sample (later edition); position 7 '6' numeric, M -> 1991
    ["1M8GDM9AXKP042788", "X", 1989], // remainder 10 -> X; position 7 '9' numeric, K -> 1989
    ["1FACP45EXLF192944", "X", 1990], // remainder 10 -> X; position 7 '5' numeric, L -> 1990
  ])("checks %s: check digit %s, model year %i", async (vin, digit, year) => {
    const tech = await signedIn(shop.tech)
    const res = await tech.get(`/api/vin/${vin}`)
    expect(res.status).toBe(200)
    expect(res.body).toMatchObject({
      vin,
      valid: true,
      checkDigit: digit,
      expectedCheckDigit: digit,
      modelYear: year,
      problems: [],
    })
  })

  it("answers 200 with valid false and the problems for a malformed VIN", async () => {
    const tech = await signedIn(shop.tech)
    const res = await tech.get("/api/vin/1J9RP1A37A16443O5")
    expect(res.status).toBe(200)
    expect(res.body.valid).toBe(false)
    expect(res.body.problems.join(" ")).toMatch(/I, O and Q/)
    const short = await tech.get("/api/vin/1J9RP")
    expect(short.body).toMatchObject({ valid: false, checkDigit: null })
    expect(short.body.problems[0]).toMatch(/5 characters; it needs 17/)
    const wrongDigit = await tech.get("/api/vin/1J9RP1A37A1644345")
    expect(wrongDigit.body).toMatchObject({ valid: false, checkDigit: "7", expectedCheckDigit: "6" })
  })

  it("needs a session", async () => {
    expect((await new ApiClient().get("/api/vin/1J9RP1A36A1644345")).status).toBe(401)
  })
})
