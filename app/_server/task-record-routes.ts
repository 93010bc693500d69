import "server-only"
import type { z } from "zod"
import { requireRole } from "@/app/_server/auth"
import { parseJson, parseParams, route } from "@/app/_server/route"
import { taskParams, type TaskParams } from "@/app/_server/services/tasks"
import type { SessionUser } from "@/lib/auth/lucia"

/**
 * The two handlers of a record kept per calibration task (its checklist, its set-up), answered as `{ [key]: … }`:
 * GET for anyone in the shop the service lets read it (null until someone fills it in); PUT, for a technician or a
 * shop lead, saves the body `schema` accepts and answers with the record as stored.
 */
export function taskRecordRoutes<S extends z.ZodType, R>(
  key: string,
  schema: S,
  read: (user: SessionUser, path: TaskParams) => Promise<R | null>,
  save: (user: SessionUser, path: TaskParams, input: z.output<S>) => Promise<R>,
) {
  return {
    GET: route<TaskParams>(async (_req, { params }) => {
      const { user } = await requireRole()
      const path = await parseParams(params, taskParams)
      return Response.json({ [key]: await read(user, path) })
    }),
    PUT: route<TaskParams>(async (req, { params }) => {
      const { user } = await requireRole("technician", "shop_lead")
      const path = await parseParams(params, taskParams)
      const input = await parseJson(req, schema)
      return Response.json({ [key]: await save(user, path, input) })
    }),
  }
}
