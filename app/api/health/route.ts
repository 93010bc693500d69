import { HeadBucketCommand } from "@aws-sdk/client-s3"
import { sql } from "kysely"
import { route } from "@/app/_server/route"
import { bucket, getS3 } from "@/app/_server/storage"
import { getDb } from "@/db/client"
import { env } from "@/lib/env"

export const dynamic = "force-dynamic"

const CHECK_MS = 2000

async function check(work: () => Promise<unknown>): Promise<boolean> {
  let timer: NodeJS.Timeout | undefined
  const timeout = new Promise<false>((resolve) => {
    timer = setTimeout(() => resolve(false), CHECK_MS)
  })
  try {
    return await Promise.race([work().then(() => true), timeout])
  } catch {
    return false
  } finally {
    clearTimeout(timer)
  }
}

/** Each part the app needs, checked at once: 200 when all answer, else a 503 naming the parts that are down. */
export const GET = route(async () => {
  const [database, storage] = await Promise.all([
    check(() => sql`select 1`.execute(getDb())),
    env().S3_ENDPOINT || env().S3_ACCESS_KEY_ID
      ? check(() => getS3().send(new HeadBucketCommand({ Bucket: bucket() })))
      : Promise.resolve(true),
  ])
  if (database && storage)
    return Response.json(
      { ok: true, parts: { database: "up", storage: "up" } },
      { headers: { "cache-control": "no-store" } },
    )
  const fields: Record<string, string> = {}
  if (!database) fields.database = "is not answering"
  if (!storage) fields.storage = "is not answering"
  return Response.json(
    { error: { code: "service_unavailable", message: `Down: ${Object.keys(fields).join(", ")}.`, fields } },
    { status: 503, headers: { "Retry-After": "5", "cache-control": "no-store" } },
  )
})
