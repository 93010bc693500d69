import { z } from "zod"
import { requireRole } from "@/app/_server/auth"
import { parseParams, parseQuery, route, uuidParam } from "@/app/_server/route"
import { textStream } from "@/app/_server/text-stream"
import { getDb, getExportDb } from "@/db/client"
import { openDriveExport } from "@/db/queries/drive-export"
import { csvChunks, driveFileChunks, gpxChunks } from "@/lib/export/stream"
import { driveFileFormatQuery } from "@/lib/validation/drive"
import { loadDriveFor, shopDriveId } from "@/app/_server/services/drives"

const params = z.object({ driveId: uuidParam })

const TYPES = {
  drive: { contentType: "application/json; charset=utf-8", ext: "drive.json" },
  gpx: { contentType: "application/gpx+xml; charset=utf-8", ext: "gpx" },
  csv: { contentType: "text/csv; charset=utf-8", ext: "csv" },
} as const

/**
 * The drive file, GPX or CSV, streamed from a database cursor (db/queries/drive-export.ts, lib/export/stream.ts):
 * memory stays flat whatever the drive's length. Everything that can refuse (sign-in, the drive, its shop, the
 * format) is checked before the first byte, so a refusal is still the error shape.
 */
export const GET = route<{ driveId: string }>(async (req, ctx) => {
  const { user } = await requireRole()
  const { driveId } = await parseParams(ctx.params, params)
  const { format } = parseQuery(req, driveFileFormatQuery)
  const db = getDb()
  const drive = await loadDriveFor(db, shopDriveId(user, driveId), user, "see")
  const source = await openDriveExport(getExportDb(), drive.id, user.shopId, { gpx: format === "gpx" })
  const chunks =
    format === "gpx"
      ? gpxChunks(source.head, source.lookahead!, source.samples, {
          name: drive.vehicle_description ?? `Drive ${drive.public_id.slice(0, 8)}`,
          creator: "Straightaway",
        })
      : format === "csv"
        ? csvChunks(source.head, source.samples)
        : driveFileChunks(source.head, source.samples)
  const { contentType, ext } = TYPES[format]
  const day = new Date(drive.created_at).toISOString().slice(0, 10)
  return new Response(textStream(chunks, { close: source.close }), {
    headers: {
      "Content-Type": contentType,
      "Content-Disposition": `attachment; filename="straightaway-${day}-${drive.public_id.slice(0, 8)}.${ext}"`,
      "Cache-Control": "private, no-store",
    },
  })
})
