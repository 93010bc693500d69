import { requireRole } from "@/app/_server/auth"
import { readJson, route } from "@/app/_server/route"
import { scoreDrive } from "@/lib/scoring"
import { MAX_DRIVE_FILE_BYTES } from "@/lib/validation/drive"
import { parseDriveFileOrThrow } from "@/app/_server/services/drive-file-input"

/** Scores a drive file sent in the body; nothing is stored. */
export const POST = route(async (req) => {
  await requireRole()
  const file = parseDriveFileOrThrow(await readJson(req, MAX_DRIVE_FILE_BYTES))
  return Response.json(scoreDrive(file))
})
