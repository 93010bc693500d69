import { liveScore } from "@/app/_server/live"
import { route } from "@/app/_server/route"
import { findScore } from "@/db/queries/scores"
import { driveForRoute } from "@/app/_server/services/drives"

/** The score as shared/specs/drive-file.md defines it: stored once finished, computed while recording. */
export const GET = route<{ driveId: string }>(async (_req, ctx) => {
  const { user, db, drive } = await driveForRoute(ctx.params, "see")
  const score =
    (drive.status === "finished" ? await findScore(db, drive.id, user.shopId) : undefined) ??
    (await liveScore(db, drive))
  return Response.json(score)
})
