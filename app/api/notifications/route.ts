import { requireRole } from "@/app/_server/auth"
import { parseJson, route } from "@/app/_server/route"
import { getDb } from "@/db/client"
import { listNotifications, markNotificationsRead } from "@/db/queries/notifications"
import type { NoticeList } from "@/lib/api/types"
import { markReadSchema } from "@/lib/validation/review"

export const GET = route(async () => {
  const { user } = await requireRole()
  const { rows, unread } = await listNotifications(getDb(), user.id, user.shopId)
  const body: NoticeList = {
    notifications: rows.map((n) => ({
      id: n.id,
      message: n.message,
      link: n.link,
      readAt: n.read_at,
      createdAt: n.created_at,
    })),
    unread,
  }
  return Response.json(body, { headers: { "cache-control": "no-store" } })
})

/** `{ids: [...]}` or `{all: true}`: marks the signed-in person's own notices read. */
export const PATCH = route(async (req) => {
  const { user } = await requireRole()
  const body = await parseJson(req, markReadSchema)
  const updated = await markNotificationsRead(getDb(), user.id, user.shopId, "all" in body ? "all" : body.ids)
  return Response.json({ updated })
})
