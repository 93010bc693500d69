import { loadSharedRecord, recordPdfResponse } from "@/app/_server/record-data"
import { route } from "@/app/_server/route"
import { getDb } from "@/db/client"
import { AppError } from "@/lib/errors"
import { issueRecordPdf } from "@/app/_server/record-seal"

// The customer's PDF behind a share link: no session, the signed token is the permission.
export const GET = route<{ token: string }>(async (_req, ctx) => {
  const { token } = await ctx.params
  const shared = await loadSharedRecord(getDb(), token, { photos: false })
  if (!shared.ok) {
    throw new AppError(
      "not_found",
      shared.reason === "expired"
        ? "This link has expired; ask the shop for a new one."
        : shared.reason === "withdrawn"
          ? "The shop has withdrawn this link; ask the shop for a new one."
          : "This link is not valid.",
    )
  }
  const issued = await issueRecordPdf(getDb(), shared.head.id, shared.head.shop_id, "share")
  if (!issued?.pdf) throw new AppError("not_found", "This link is not valid.")
  return recordPdfResponse(issued.pdf, shared.head, { "referrer-policy": "no-referrer" })
})
