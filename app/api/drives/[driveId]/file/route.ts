import { z } from "zod"
import { requireRole } from "@/app/_server/auth"
import { parseParams, parseQuery, route, uuidParam } from "@/app/_server/route"
import { driveDownload } from "@/app/_server/services/downloads"
import { driveFileFormatQuery } from "@/lib/validation/drive"

const params = z.object({ driveId: uuidParam })

/** The drive file, GPX or CSV, streamed (app/_server/services/downloads.ts). */
export const GET = route<{ driveId: string }>(async (req, ctx) => {
  const { user } = await requireRole()
  const { driveId } = await parseParams(ctx.params, params)
  const { format } = parseQuery(req, driveFileFormatQuery)
  const { body, headers } = await driveDownload(user, driveId, format)
  return new Response(body, { headers })
})
