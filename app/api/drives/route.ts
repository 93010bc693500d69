import { requireRole } from "@/app/_server/auth"
import { parseJson, parseQuery, route } from "@/app/_server/route"
import { listDrivesPage, startDrive } from "@/app/_server/services/drive-intake"
import { createDriveSchema, listDrivesQuery } from "@/lib/validation/drive"

export const GET = route(async (req) => {
  const { user } = await requireRole()
  return Response.json(await listDrivesPage(user, parseQuery(req, listDrivesQuery)))
})

export const POST = route(async (req) => {
  const { user } = await requireRole("technician", "shop_lead")
  // every field is optional (api.md): no body at all starts an unplanned drive
  const input = await parseJson(req, createDriveSchema, { emptyAs: {} })
  const { drive, created } = await startDrive(user, input)
  return Response.json({ drive }, { status: created ? 201 : 200 })
})
