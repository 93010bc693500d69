// Requests the app's server (scripts/server.mjs) answers itself, before Next.js sees them: the recorder's sample
// batches, ten a minute per phone. Next's request pipeline costs a few milliseconds of CPU a request whatever the
// route does; this path costs a fraction of that and runs the same handler as the route file
// (app/api/drives/[driveId]/samples/route.ts). esbuild bundles this file into the build (scripts/build-early.mjs).
//
// Only batches that name themselves in the x-batch-id header come here, which are exactly the requests that already
// skip the proxy (proxy.ts matcher), so nothing the proxy does is lost. Anything else goes on to Next.
import type { IncomingMessage, ServerResponse } from "node:http"
import { MAX_JSON_BYTES, bodyTextAnswering } from "@/app/_server/route"
import { answerSampleBatch } from "@/app/_server/sample-batch"
import { servedOverHttps, STRICT_TRANSPORT_SECURITY } from "@/lib/http/security-headers"
import { BATCH_ID_HEADER } from "@/lib/recorder/batching"
import { BodyTooLargeError } from "@/lib/validation/json-body"

const SAMPLE_BATCH_PATH = /^\/api\/drives\/([0-9A-Za-z-]+)\/samples$/

/** What next.config.mjs's headers() adds to a sample batch's answer. */
const CONFIG_HEADERS: ReadonlyArray<readonly [string, string]> = [
  ["x-content-type-options", "nosniff"],
  ["x-frame-options", "DENY"],
  ["referrer-policy", "strict-origin-when-cross-origin"],
  ["cache-control", "no-store, no-transform"],
]

/** Answers the request and returns true when it is one of the early routes; false leaves it untouched for Next. */
export function answerEarly(req: IncomingMessage, res: ServerResponse): boolean {
  if (req.method !== "POST" || req.headers[BATCH_ID_HEADER] === undefined) return false
  const url = req.url ?? ""
  const match = SAMPLE_BATCH_PATH.exec(url)
  if (!match) return false
  void answer(req, res, match[1]!)
  return true
}

async function answer(req: IncomingMessage, res: ServerResponse, driveId: string) {
  // The body is read only if the handler asks for it: a replayed batch is answered from its claim, and its body then
  // drained unread, which keeps the connection for the next request.
  let reading = false
  // Node joins a repeated header with ", " (Set-Cookie aside, which a request has not), as Headers.get does.
  const header = (name: string) => {
    const value = req.headers[name.toLowerCase()]
    return value === undefined ? null : Array.isArray(value) ? value.join(", ") : value
  }
  // The app's server speaks plain HTTP; only the path is read from it (the log), and it matched SAMPLE_BATCH_PATH.
  const url = `http://localhost${req.url}`
  try {
    const answer = await answerSampleBatch(
      {
        method: "POST",
        url,
        header,
        readText: () => {
          reading = true
          return bodyTextAnswering(() => readBody(req, MAX_JSON_BYTES))
        },
      },
      driveId,
    )
    if (!reading) req.resume()
    const text = Buffer.from(JSON.stringify(answer.body))
    // Flat name, value, name, value (Node's writeHead).
    const out: string[] = ["content-type", "application/json", "content-length", String(text.length)]
    const own = answer.headers ?? {}
    const ownNames = new Set(Object.keys(own).map((name) => name.toLowerCase()))
    for (const [name, value] of CONFIG_HEADERS) if (!ownNames.has(name)) out.push(name, value)
    // As proxy.ts adds to every other API answer: HSTS when the request came over HTTPS (a trusted proxy's
    // X-Forwarded-Proto or an https APP_URL says so).
    if (servedOverHttps(url, { get: header }, process.env))
      out.push("strict-transport-security", STRICT_TRANSPORT_SECURITY)
    for (const [name, value] of Object.entries(own)) out.push(name.toLowerCase(), value)
    res.writeHead(answer.status, out)
    res.end(text)
  } catch (error) {
    // answerSampleBatch answers every error in the error shape; this is only for a failure outside it (a broken socket).
    console.error("[straightaway] a sample batch could not be answered", error)
    if (!res.headersSent) res.writeHead(500, { "content-type": "application/json" })
    res.end(JSON.stringify({ error: { code: "internal_error", message: "Something went wrong on our side." } }))
  }
}

/**
 * The request's body as text, counted as it arrives whatever Content-Length says (lib/validation/json-body.ts
 * readBodyBytes does the same for a web stream): over `maxBytes` refused, the rest of the body then read and
 * dropped so that the answer still reaches the client.
 */
function readBody(req: IncomingMessage, maxBytes: number): Promise<string> {
  const declared = Number(req.headers["content-length"])
  if (Number.isFinite(declared) && declared > maxBytes) return Promise.reject(new BodyTooLargeError(maxBytes))
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = []
    let total = 0
    const onData = (chunk: Buffer) => {
      total += chunk.length
      if (total > maxBytes) {
        req.off("data", onData).off("end", onEnd)
        req.resume()
        reject(new BodyTooLargeError(maxBytes))
      } else chunks.push(chunk)
    }
    const onEnd = () => resolve(Buffer.concat(chunks, total).toString("utf8"))
    // A client gone before the end: "close" without "end".
    const onClose = () => {
      if (!req.complete) reject(new Error("The request closed before its body ended."))
    }
    req.on("data", onData).on("end", onEnd).on("error", reject).on("close", onClose)
  })
}
