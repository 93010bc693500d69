import { z } from "zod"
import { requireRole } from "@/app/_server/auth"
import { parseQuery, route } from "@/app/_server/route"
import { getReadDb } from "@/db/client"
import { listReviewQueue } from "@/db/queries/reviews"
import { AppError } from "@/lib/errors"
import { parseDriveCursor } from "@/lib/validation/drive"

export const GET = route(async (req) => {
  const { user } = await requireRole("shop_lead")
  const { cursor } = parseQuery(req, z.object({ cursor: z.string().max(200).optional() }))
  const parsed = parseDriveCursor(cursor)
  if (parsed === null)
    throw new AppError("validation_failed", "cursor: is not one this server gave out", { cursor: "is invalid" })
  const { rows, nextCursor } = await listReviewQueue(getReadDb(), user.shopId, parsed)
  return Response.json({
    drives: rows.map((r) => {
      const score = r.result as { reasons?: string[]; harshEvents?: { accel: number; decel: number } }
      return {
        id: r.public_id,
        jobId: r.job_id,
        taskId: r.task_id,
        roNumber: r.ro_number,
        vehicleDescription: r.vehicle_description,
        vehicle:
          r.vehicle_make || r.vehicle_model
            ? { year: r.vehicle_year, make: r.vehicle_make, model: r.vehicle_model }
            : null,
        verdict: r.verdict,
        reasons: score.reasons ?? [],
        harshEvents: score.harshEvents ?? { accel: 0, decel: 0 },
        driverName: r.driver_name,
        finishedAt: r.finished_at,
      }
    }),
    nextCursor,
  })
})
