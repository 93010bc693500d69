import { z } from "zod"
import { requireRole } from "@/app/_server/auth"
import { getFormatPrefs } from "@/app/_server/format-prefs"
import { loadNumbers, NUMBERS_DEFAULT_DAYS, numbersCsvBody } from "@/app/_server/numbers"
import { parseQuery, route } from "@/app/_server/route"
import { getReadDb, readConnections } from "@/db/client"

const query = z.object({
  days: z.coerce
    .number({ error: "must be a number of days" })
    .int({ error: "must be a whole number" })
    .min(1, { error: "must be 1 to 730" })
    .max(730, { error: "must be 1 to 730" })
    .default(NUMBERS_DEFAULT_DAYS),
  format: z.enum(["json", "csv"], { error: "must be json or csv" }).default("json"),
})

export const GET = route(async (req) => {
  const { user } = await requireRole("shop_lead")
  const { days, format } = parseQuery(req, query)
  const { timeZone } = await getFormatPrefs(user.shopId)
  if (format === "csv") {
    return new Response(await numbersCsvBody(getReadDb(), readConnections, user.shopId, days, timeZone), {
      headers: {
        "content-type": "text/csv; charset=utf-8",
        "content-disposition": `attachment; filename="straightaway-drives-${days}d.csv"`,
        "cache-control": "private, no-store",
      },
    })
  }
  return Response.json({ days, ...(await loadNumbers(getReadDb(), user.shopId, days, timeZone)) })
})
