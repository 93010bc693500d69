import { z } from "zod"
import { requireRole } from "@/app/_server/auth"
import { parseJson, parseParams, route, uuidParam } from "@/app/_server/route"
import { changeJob, jobForUser } from "@/app/_server/services/jobs"
import { jobChangeSchema } from "@/lib/validation/job"

const paramsSchema = z.object({ jobId: uuidParam })

export const GET = route<{ jobId: string }>(async (_req, { params }) => {
  const { user } = await requireRole()
  const { jobId } = await parseParams(params, paramsSchema)
  return Response.json({ job: await jobForUser(user, jobId) })
})

export const PATCH = route<{ jobId: string }>(async (req, { params }) => {
  const { user } = await requireRole("technician", "shop_lead")
  const { jobId } = await parseParams(params, paramsSchema)
  const changes = await parseJson(req, jobChangeSchema)
  return Response.json({ job: await changeJob(user, jobId, changes) })
})
