// Issue 15: requests that race for one unique thing. The database keeps one; the others are a 409 in the error
// shape (never a 500), and two intakes of one new VIN at once share one vehicle row.
import { randomUUID } from "node:crypto"
import { beforeAll, describe, expect, it } from "vitest"
import { createTestShop, testDb, type TestShop } from "../../helpers/db"
import { type ApiClient, signedIn } from "../../helpers/http"
import { expectErrorShape } from "../contract/world"
import { inventedVin, newJobBody } from "../../helpers/jobs"

let shop: TestShop
let admins: ApiClient[]

beforeAll(async () => {
  shop = await createTestShop("Races")
  admins = await Promise.all(Array.from({ length: 8 }, () => signedIn(shop.admin)))
})

describe("concurrent creation", () => {
  it("8 admins adding one e-mail at once: one 201, seven 409s naming the e-mail", async () => {
    for (let round = 0; round < 3; round++) {
      const email = `same-${randomUUID().slice(0, 8)}@test.invalid`
      const answers = await Promise.all(
        admins.map((a, i) =>
          a.post("/api/users", { email, name: `Racer ${i}`, role: "technician", password: "a-long-enough-password" }),
        ),
      )
      const statuses = answers.map((r) => r.status).sort()
      expect(statuses).toEqual([201, 409, 409, 409, 409, 409, 409, 409])
      for (const r of answers.filter((x) => x.status === 409)) {
        expectErrorShape(r, 409)
        expect(r.body.error.fields.email).toBe("is already in use")
      }
      const rows = await testDb().selectFrom("app_user").select("id").where("email", "=", email).execute()
      expect(rows).toHaveLength(1)
    }
  })

  it("8 jobs for one new VIN at once: all made, one vehicle row, every job on it", async () => {
    const leads = await Promise.all(Array.from({ length: 8 }, () => signedIn(shop.lead)))
    for (let round = 0; round < 3; round++) {
      const vin = inventedVin()
      const answers = await Promise.all(
        leads.map((c, i) =>
          c.post(
            "/api/jobs",
            newJobBody({ vehicle: { vin, make: "Corvane", model: "Tallis", plate: i === 3 ? "SAW 333" : null } }),
          ),
        ),
      )
      expect(answers.map((r) => r.status)).toEqual(Array(8).fill(201))
      const vehicles = await testDb()
        .selectFrom("vehicle")
        .selectAll()
        .where("shop_id", "=", shop.shopId)
        .where("vin", "=", vin)
        .execute()
      expect(vehicles).toHaveLength(1)
      expect(new Set(answers.map((r) => r.body.job.vehicle.id))).toEqual(new Set([vehicles[0]!.id]))
      // A blank box keeps what another intake knew.
      expect(vehicles[0]!.plate).toBe("SAW 333")
    }
  })

  it("the same VIN in another shop is that shop's own vehicle", async () => {
    const other = await createTestShop("Races other")
    const vin = inventedVin()
    const [a, b] = await Promise.all([
      (await signedIn(shop.lead)).post("/api/jobs", newJobBody({ vehicle: { vin } })),
      (await signedIn(other.lead)).post("/api/jobs", newJobBody({ vehicle: { vin } })),
    ])
    expect([a.status, b.status]).toEqual([201, 201])
    expect(a.body.job.vehicle.id).not.toBe(b.body.job.vehicle.id)
  })
})
