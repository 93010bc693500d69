import { z } from "zod"
import { requireRole } from "@/app/_server/auth"
import { parseParams, parseQuery, route, uuidParam } from "@/app/_server/route"
import { getDb } from "@/db/client"
import { loadDriveFile } from "@/db/queries/drive-file"
import { toCsv, toGpx } from "@/lib/export"
import { driveFileFormatQuery } from "@/lib/validation/drive"
import { loadDriveFor } from "../../_service"

const params = z.object({ driveId: uuidParam })

const TYPES = {
  drive: { contentType: "application/json; charset=utf-8", ext: "drive.json" },
  gpx: { contentType: "application/gpx+xml; charset=utf-8", ext: "gpx" },
  csv: { contentType: "text/csv; charset=utf-8", ext: "csv" },
} as const

export const GET = route<{ driveId: string }>(async (req, ctx) => {
  const { user } = await requireRole()
  const { driveId } = await parseParams(ctx.params, params)
  const { format } = parseQuery(req, driveFileFormatQuery)
  const db = getDb()
  const drive = await loadDriveFor(db, driveId, user, "see")
  const file = await loadDriveFile(db, drive.id, user.shopId)
  const body =
    format === "gpx"
      ? toGpx(file, { name: drive.vehicle_description ?? `Drive ${drive.id.slice(0, 8)}`, creator: "Straightaway" })
      : format === "csv"
        ? toCsv(file)
        : JSON.stringify(file)
  const { contentType, ext } = TYPES[format]
  const day = new Date(drive.created_at).toISOString().slice(0, 10)
  return new Response(body, {
    headers: {
      "Content-Type": contentType,
      "Content-Disposition": `attachment; filename="straightaway-${day}-${drive.id.slice(0, 8)}.${ext}"`,
      "Cache-Control": "private, no-store",
    },
  })
})
