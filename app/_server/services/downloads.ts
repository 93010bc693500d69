import "server-only"
// A drive's downloads: the drive file, GPX or CSV, streamed from a database cursor (db/queries/drive-export.ts,
// lib/export/stream.ts) on the downloads' own pool, so memory stays flat whatever the drive's length.
import { loadDriveFor, shopDriveId } from "@/app/_server/services/drives"
import { textStream } from "@/app/_server/text-stream"
import { getDb, getExportDb } from "@/db/client"
import { openDriveExport } from "@/db/queries/drive-export"
import type { SessionUser } from "@/lib/auth/lucia"
import { csvChunks, driveFileChunks, gpxChunks } from "@/lib/export/stream"

const TYPES = {
  drive: { contentType: "application/json; charset=utf-8", ext: "drive.json" },
  gpx: { contentType: "application/gpx+xml; charset=utf-8", ext: "gpx" },
  csv: { contentType: "text/csv; charset=utf-8", ext: "csv" },
} as const

export type DownloadFormat = keyof typeof TYPES

/**
 * The download's body and headers. Everything that can refuse (the drive, its shop, access) is checked before the
 * body's first byte, so a refusal is still the error shape.
 */
export async function driveDownload(user: SessionUser, publicDriveId: string, format: DownloadFormat) {
  const drive = await loadDriveFor(getDb(), shopDriveId(user, publicDriveId), user, "see")
  const source = await openDriveExport(getExportDb(), drive.id, user.shopId, { gpx: format === "gpx" })
  const name = drive.vehicle_description ?? `Drive ${drive.public_id.slice(0, 8)}`
  const chunks =
    format === "gpx"
      ? gpxChunks(source.head, source.lookahead!, source.samples, { name, creator: "Straightaway" })
      : format === "csv"
        ? csvChunks(source.head, source.samples)
        : driveFileChunks(source.head, source.samples)
  const { contentType, ext } = TYPES[format]
  const day = new Date(drive.created_at).toISOString().slice(0, 10)
  return {
    body: textStream(chunks, { close: source.close }),
    headers: {
      "Content-Type": contentType,
      "Content-Disposition": `attachment; filename="straightaway-${day}-${drive.public_id.slice(0, 8)}.${ext}"`,
      "Cache-Control": "private, no-store",
    },
  }
}
