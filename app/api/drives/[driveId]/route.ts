import { liveCounts, liveScore } from "@/app/_server/live"
import { route } from "@/app/_server/route"
import { countDriveData } from "@/db/queries/drives"
import { findScore } from "@/db/queries/scores"
import { driveForRoute, driveJson } from "@/app/_server/services/drives"

export const GET = route<{ driveId: string }>(async (_req, ctx) => {
  const { user, db, drive } = await driveForRoute(ctx.params, "see")
  // A drive being recorded has no stored score yet: the process's live scorer has it (app/_server/live.ts).
  const stored = drive.status === "finished" ? await findScore(db, drive.id, user.shopId) : undefined
  const score = stored ?? (await liveScore(db, drive))
  const counts = (stored ? null : liveCounts(drive.id)) ?? (await countDriveData(db, drive.id, user.shopId))
  return Response.json({ drive: driveJson(drive, { counts }), score })
})
