import { z } from "zod"
import { requireRole } from "@/app/_server/auth"
import { otherMethodsRefused, parseParams, readRequestText, route, uuidParam } from "@/app/_server/route"
import { addSampleBatch } from "@/app/_server/services/recording"
import { BATCH_ID_HEADER } from "@/lib/recorder/batching"

const params = z.object({ driveId: uuidParam })

/** A batch of samples (app/_server/services/recording.ts says how it is stored, once, whole or not at all). */
export const POST = route<{ driveId: string }>(async (req, ctx) => {
  const { user } = await requireRole()
  const { driveId } = await parseParams(ctx.params, params)
  const result = await addSampleBatch(user, driveId, req.headers.get(BATCH_ID_HEADER), () => readRequestText(req))
  return Response.json(result)
})

// A batch that names itself in the x-batch-id header reaches this file without the proxy (proxy.ts), so the file
// refuses the other methods itself, as the proxy does.
export const { GET, HEAD, PUT, PATCH, DELETE, OPTIONS } = otherMethodsRefused(["POST"])
