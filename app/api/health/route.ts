import { sql } from "kysely"
import { route } from "@/app/_server/route"
import { getDb } from "@/db/client"

export const dynamic = "force-dynamic"

export const GET = route(async () => {
  await sql`select 1`.execute(getDb())
  return Response.json({ ok: true })
})
