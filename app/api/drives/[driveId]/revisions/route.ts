import { route } from "@/app/_server/route"
import { CAUSE_TEXT } from "@/app/_server/revisions"
import { listRevisions } from "@/db/queries/revisions"
import { driveForRoute } from "@/app/_server/services/drives"

/** The record's revisions, newest first: each with its cause, time, score, review decision, digest and code. */
export const GET = route<{ driveId: string }>(async (_req, ctx) => {
  const { user, db, drive } = await driveForRoute(ctx.params, "see")
  const rows = await listRevisions(db, drive.id, user.shopId)
  return Response.json({
    revisions: rows.map((r) => ({
      revision: r.revision,
      cause: r.cause,
      causeText: CAUSE_TEXT[r.cause],
      verdict: r.verdict,
      reviewDecision: r.review_decision,
      createdAt: r.created_at,
      createdBy: r.by_name,
      digest: r.digest,
      code: r.code,
      score: r.result,
    })),
  })
})
