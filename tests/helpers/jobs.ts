import { withCheckDigit } from "@/lib/vin"
import type { ApiClient } from "./http"

let counter = 0

/** An invented VIN with a valid check digit; position 7 alphabetic and position 10 "R" make it a 2024. */
export function inventedVin(): string {
  counter += 1
  const serial = String((Date.now() + counter) % 1_000_000).padStart(6, "0")
  return withCheckDigit(`0ZV4KAB3?R1${serial}`)
}

export function newJobBody(overrides: Record<string, unknown> = {}) {
  counter += 1
  return {
    roNumber: `RO-${Date.now()}-${counter}`,
    customer: { name: "Wren Castellano", email: "wren@example.invalid", phone: "555-0100" },
    vehicle: { vin: inventedVin(), make: "Corvane", model: "Tallis", plate: "SAW 204" },
    tasks: [{ sensor: "forward_radar", method: "dynamic", reason: "bumper_or_grille_work" }],
    ...overrides,
  }
}

export async function createJob(client: ApiClient, overrides: Record<string, unknown> = {}) {
  const res = await client.post("/api/jobs", newJobBody(overrides))
  if (res.status !== 201) throw new Error(`job create failed: ${res.status} ${res.text}`)
  return res.body.job
}
