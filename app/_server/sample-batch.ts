import "server-only"
import { z } from "zod"
import { parseParams, readRequestText, route, uuidParam } from "@/app/_server/route"
import { addSampleBatch, lookUpNamedBatch } from "@/app/_server/services/recording"
import { sessionForToken, tokenFromCookieHeader } from "@/app/_server/session-token"
import { AppError } from "@/lib/errors"
import { BATCH_ID_HEADER } from "@/lib/recorder/batching"

const params = z.object({ driveId: uuidParam })

/**
 * POST /api/drives/:id/samples, a batch of samples (services/recording.ts says how it is stored: once, whole or not
 * at all). The session comes from the request's own Cookie header rather than Next's request scope, so the same
 * handler answers in the route file and in the app's server (scripts/server.mjs), which takes the recorder's batches
 * before Next does.
 */
export const postSampleBatch = route<{ driveId: string }>(async (req, ctx) => {
  const token = tokenFromCookieHeader(req.headers.get("cookie"))
  const batchId = req.headers.get(BATCH_ID_HEADER)
  // A named batch with a settled session: the session, the drive and the batch's claim in one statement.
  const named = await lookUpNamedBatch(token, ctx.params, batchId)
  const { current, cookie } = named?.user
    ? { current: { user: named.user }, cookie: null }
    : await sessionForToken(token)
  const setCookie = cookie ? { "set-cookie": cookie.serialize() } : undefined
  if (!current.user) throw new AppError("not_signed_in", "Sign in first.", undefined, setCookie)
  const { driveId } = await parseParams(ctx.params, params)
  const result = await addSampleBatch(current.user, driveId, batchId, () => readRequestText(req), named?.found)
  return Response.json(result, { headers: setCookie })
})
