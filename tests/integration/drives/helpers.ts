import { randomUUID } from "node:crypto"
import type { Sample } from "@/lib/drive-file"
import { generateDrive } from "@/lib/tracks"
import type { ApiClient } from "../../helpers/http"

/** A drive started through the API with a client-made id. */
export async function startDrive(client: ApiClient, body: Record<string, unknown> = {}) {
  const id = randomUUID()
  const res = await client.post("/api/drives", { id, vehicleDescription: "2019 Invented Corvan, white", ...body })
  if (res.status !== 201) throw new Error(`start failed: ${res.status} ${res.text}`)
  return res.body.drive as { id: string; [k: string]: unknown }
}

/** The headers of a sample batch that names itself, as the recorder sends it: the app's own server answers it. */
export function namedBatchHeaders(batchId: string) {
  return { "x-batch-id": batchId, "content-type": "application/json" }
}

/** A sample batch posted as the recorder posts it, named in x-batch-id (app/_server/early-routes.ts answers it). */
export function postNamedBatch(client: ApiClient, driveId: string, batchId: string, samples: unknown[]) {
  return client.request("POST", `/api/drives/${driveId}/samples`, undefined, {
    raw: JSON.stringify({ batchId, samples }),
    headers: namedBatchHeaders(batchId),
  })
}

export function sampleRun(count: number, seed = 7, startMs = Date.UTC(2026, 0, 1, 10)): Sample[] {
  const minutes = Math.max(1, Math.ceil(count / 60) + 1)
  return generateDrive({ seed, startMs, minutes, pattern: "never-cleared" }).samples.slice(0, count)
}

/** One more person in a test shop (the shop helper makes one per role). */
export async function addPerson(
  shopId: string,
  role: "technician" | "co_driver" | "shop_lead",
  copyPasswordOf: { id: string; password: string },
) {
  const { testDb } = await import("../../helpers/db")
  const { password_hash } = await testDb()
    .selectFrom("app_user")
    .select("password_hash")
    .where("id", "=", copyPasswordOf.id)
    .executeTakeFirstOrThrow()
  const id = randomUUID()
  const email = `${role}-${id.slice(0, 8)}@test.invalid`
  await testDb()
    .insertInto("app_user")
    .values({ id, shop_id: shopId, email, name: `Extra ${role}`, role, password_hash })
    .execute()
  return { id, email, password: copyPasswordOf.password }
}
