import "server-only"
import { z } from "zod"
import {
  assertSameOrigin,
  errorAnswer,
  parseParams,
  readRequestText,
  uuidParam,
  type JsonAnswer,
} from "@/app/_server/route"
import { addSampleBatch, lookUpNamedBatch } from "@/app/_server/services/recording"
import { sessionForToken, tokenFromCookieHeader } from "@/app/_server/session-token"
import { AppError } from "@/lib/errors"
import { BATCH_ID_HEADER } from "@/lib/recorder/batching"

const params = z.object({ driveId: uuidParam })

/**
 * A sample batch's request as the handler reads it: from a web Request in the route file, or straight from
 * node:http in the app's server (early-routes.ts), which takes the recorder's batches before Next does and so
 * builds no Request, Headers or body stream for them. `header` takes a lowercase name; `readText` reads the body
 * (only when the handler needs it), over the API's limit a 413.
 */
export interface SampleBatchRequest {
  method: string
  url: string
  header(name: string): string | null
  readText(): Promise<string>
}

/**
 * POST /api/drives/:id/samples, a batch of samples (services/recording.ts says how it is stored: once, whole or not
 * at all), answered as route() answers: the Origin check first, every error in the API's shape. The session comes
 * from the request's own Cookie header rather than Next's request scope, so the same handler answers in both places.
 */
export async function answerSampleBatch(req: SampleBatchRequest, publicDriveId: string): Promise<JsonAnswer> {
  try {
    assertSameOrigin(req.method, req.header("origin"))
    const token = tokenFromCookieHeader(req.header("cookie"))
    const batchId = req.header(BATCH_ID_HEADER)
    // A named batch with a settled session: the session, the drive and the batch's claim in one statement.
    const named = await lookUpNamedBatch(token, publicDriveId, batchId)
    const { current, cookie } = named?.user
      ? { current: { user: named.user }, cookie: null }
      : await sessionForToken(token)
    const setCookie = cookie ? { "set-cookie": cookie.serialize() } : undefined
    if (!current.user) throw new AppError("not_signed_in", "Sign in first.", undefined, setCookie)
    const { driveId } = await parseParams(Promise.resolve({ driveId: publicDriveId }), params)
    const result = await addSampleBatch(current.user, driveId, batchId, () => req.readText(), named?.found)
    return { status: 200, body: result, headers: setCookie }
  } catch (error) {
    return errorAnswer(error, req.method, req.url)
  }
}

/** The route file's POST: answerSampleBatch over a web Request. */
export async function postSampleBatch(req: Request, ctx: { params: Promise<{ driveId: string }> }) {
  const request: SampleBatchRequest = {
    method: req.method,
    url: req.url,
    header: (name) => req.headers.get(name),
    readText: () => readRequestText(req),
  }
  const answer = await answerSampleBatch(request, (await ctx.params).driveId)
  return Response.json(answer.body, { status: answer.status, headers: answer.headers })
}
