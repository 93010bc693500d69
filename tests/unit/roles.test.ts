import { describe, expect, it } from "vitest"
import { refusedPersonChange } from "@/lib/auth/roles"

describe("who may change whom (admin)", () => {
  it("lets an admin disable or change anyone else", () => {
    expect(refusedPersonChange("a", "b", { disabled: true })).toBeNull()
    expect(refusedPersonChange("a", "b", { role: "technician" })).toBeNull()
  })

  it("refuses an admin disabling themself or giving up their own admin role", () => {
    expect(refusedPersonChange("a", "a", { disabled: true })).toMatch(/cannot disable yourself/)
    expect(refusedPersonChange("a", "a", { role: "shop_lead" })).toMatch(/admin role/)
  })

  it("lets an admin rename themself, keep their role, or enable themself", () => {
    expect(refusedPersonChange("a", "a", { role: "admin" })).toBeNull()
    expect(refusedPersonChange("a", "a", { disabled: false })).toBeNull()
    expect(refusedPersonChange("a", "a", {})).toBeNull()
  })
})
