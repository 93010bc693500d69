import { requireRole } from "@/app/_server/auth"
import { parseQuery, readJson, route } from "@/app/_server/route"
import { parseDriveFileOrThrow } from "@/app/_server/services/drive-file-input"
import { importDrive } from "@/app/_server/services/drive-intake"
import { MAX_DRIVE_FILE_BYTES, importQuery } from "@/lib/validation/drive"

/** A drive file from elsewhere, stored as a finished, scored drive. The score is of what was stored. */
export const POST = route(async (req) => {
  const { user } = await requireRole("technician", "shop_lead")
  const to = parseQuery(req, importQuery)
  const file = parseDriveFileOrThrow(await readJson(req, MAX_DRIVE_FILE_BYTES))
  return Response.json(await importDrive(user, to, file), { status: 201 })
})
