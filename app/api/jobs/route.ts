import { requireRole } from "@/app/_server/auth"
import { parseJson, parseQuery, route } from "@/app/_server/route"
import { createJob, listJobsPage } from "@/app/_server/services/jobs"
import { jobListQuerySchema, newJobSchema } from "@/lib/validation/job"

export const GET = route(async (req) => {
  const { user } = await requireRole("technician", "shop_lead")
  return Response.json(await listJobsPage(user, parseQuery(req, jobListQuerySchema)))
})

export const POST = route(async (req) => {
  const { user } = await requireRole("technician", "shop_lead")
  const input = await parseJson(req, newJobSchema)
  return Response.json({ job: await createJob(user, input) }, { status: 201 })
})
