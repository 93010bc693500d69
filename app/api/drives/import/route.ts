import { randomUUID } from "node:crypto"
import { requireRole } from "@/app/_server/auth"
import { noticeDriveWaiting, sendReviewMails } from "@/app/_server/review-notices"
import { parseQuery, readJson, route } from "@/app/_server/route"
import { getDb } from "@/db/client"
import { findDriveInShop, insertDrive } from "@/db/queries/drives"
import { insertMarks } from "@/db/queries/marks"
import { insertSamples } from "@/db/queries/samples"
import { resolveProfile } from "@/lib/drive-file"
import { MAX_DRIVE_FILE_BYTES, importQuery } from "@/lib/validation/drive"
import { driveJson, finishAndScore } from "../_service"
import { resolveNewDrive } from "../_new-drive"
import { parseDriveFileOrThrow } from "../../score/_parse"

/** A drive file from elsewhere, stored as a finished, scored drive. The score is of what was stored. */
export const POST = route(async (req) => {
  const { user } = await requireRole("technician", "shop_lead")
  const { jobId, taskId } = parseQuery(req, importQuery)
  const file = parseDriveFileOrThrow(await readJson(req, MAX_DRIVE_FILE_BYTES))
  const db = getDb()
  const values = await resolveNewDrive(db, user, randomUUID(), { jobId, taskId })
  const id = values.id
  // The file's own profile (defaults for missing keys) is the one it was held to, whatever the task says.
  values.profile = resolveProfile(file.profile) as unknown as Record<string, unknown>
  values.profileVersionId = null
  values.kind = file.format === "straightaway.drive/2" ? file.kind : "learn"
  values.roadTest = file.format === "straightaway.drive/2" ? (file.roadTest?.checks ?? null) : null
  const result = await db.transaction().execute(async (trx) => {
    await insertDrive(trx, { ...values, source: "import" })
    await insertSamples(trx, id, user.shopId, file.samples)
    await insertMarks(
      trx,
      id,
      user.shopId,
      file.marks.map((m) => ({ ...m, id: randomUUID() })),
      user.id,
    )
    const drive = (await findDriveInShop(trx, id, user.shopId))!
    const finished = await finishAndScore(trx, drive)
    return { ...finished, mails: await noticeDriveWaiting(trx, finished.drive, finished.score) }
  })
  await sendReviewMails(result.mails)
  return Response.json({ drive: driveJson(result.drive), score: result.score }, { status: 201 })
})
