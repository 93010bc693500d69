import { z } from "zod"
import { requireRole } from "@/app/_server/auth"
import { parseParams, route, uuidParam } from "@/app/_server/route"
import { getReadDb } from "@/db/client"
import { findLoopInShop, listDrivesOfLoop } from "@/db/queries/roads"
import { notFound } from "@/lib/errors"
import { median } from "@/lib/roads/model"

const params = z.object({ loopId: uuidParam })

/** One loop of the shop's road knowledge and the past drives on it; another shop's loop is a 404. */
export const GET = route(async (_req, ctx) => {
  const { user } = await requireRole("technician", "shop_lead")
  const { loopId } = await parseParams(ctx.params, params)
  const db = getReadDb()
  const loop = (await findLoopInShop(db, loopId, user.shopId)) ?? notFound("That loop")
  const drives = await listDrivesOfLoop(db, loop.id, user.shopId)
  const cleared = drives.filter((d) => d.cleared_seconds != null).map((d) => d.cleared_seconds!)
  return Response.json({
    loop: {
      id: loop.id,
      number: loop.number,
      name: loop.name ?? `Loop ${loop.number}`,
      medianClearSeconds: cleared.length ? median(cleared) : null,
      drives: drives.map((d) => ({
        driveId: d.drive_id,
        startedAt: d.started_at,
        hour: d.hour,
        weekday: d.weekday,
        drivenSeconds: d.driven_seconds,
        qualifyingSeconds: d.qualifying_seconds,
        clearedSeconds: d.cleared_seconds,
      })),
    },
  })
})
