import { route } from "@/app/_server/route"
import { countDriveData } from "@/db/queries/drives"
import { findScore } from "@/db/queries/scores"
import { driveForRoute, driveJson, scoreStoredDrive } from "../_service"

export const GET = route<{ driveId: string }>(async (_req, ctx) => {
  const { user, db, drive } = await driveForRoute(ctx.params, "see")
  // A drive being recorded has no stored score yet: score what has arrived so far.
  const [counts, stored] = await Promise.all([countDriveData(db, drive.id, user.shopId), findScore(db, drive.id, user.shopId)])
  const score = stored ?? (await scoreStoredDrive(db, drive.id, user.shopId))
  return Response.json({ drive: driveJson(drive, { counts }), score })
})
