// Requests the app's server (scripts/server.mjs) answers itself, before Next.js sees them: the recorder's sample
// batches, ten a minute per phone. Next's request pipeline costs a few milliseconds of CPU a request whatever the
// route does; this path costs a fraction of that and runs the same handler as the route file
// (app/api/drives/[driveId]/samples/route.ts). esbuild bundles this file into the build (scripts/build-early.mjs).
//
// Only batches that name themselves in the x-batch-id header come here, which are exactly the requests that already
// skip the proxy (proxy.ts matcher), so nothing the proxy does is lost. Anything else goes on to Next.
import type { IncomingMessage, ServerResponse } from "node:http"
import { postSampleBatch } from "@/app/_server/sample-batch"
import { BATCH_ID_HEADER } from "@/lib/recorder/batching"

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
  // The body is handed over only if the handler reads it: a replayed batch is answered from its claim, and its body
  // then drained unread, which keeps the connection for the next request.
  let reading = false
  const body = new ReadableStream<Uint8Array>({
    pull(controller) {
      if (reading) return
      reading = true
      req.on("data", (chunk: Buffer) =>
        controller.enqueue(new Uint8Array(chunk.buffer, chunk.byteOffset, chunk.length)),
      )
      req.on("end", () => controller.close())
      req.on("error", (error) => controller.error(error))
    },
  })
  try {
    const headers = new Headers()
    const raw = req.rawHeaders
    for (let i = 0; i < raw.length; i += 2) headers.append(raw[i]!, raw[i + 1]!)
    const request = new Request(`http://${req.headers.host ?? "localhost"}${req.url}`, {
      method: "POST",
      headers,
      body,
      duplex: "half",
    } as RequestInit)
    const response = await postSampleBatch(request, { params: Promise.resolve({ driveId }) })
    const text = Buffer.from(await response.arrayBuffer())
    if (!reading) req.resume()
    // Flat name, value, name, value (Node's writeHead); the Headers iterator gives each Set-Cookie on its own.
    const out: string[] = ["content-length", String(text.length)]
    for (const [name, value] of CONFIG_HEADERS) if (!response.headers.has(name)) out.push(name, value)
    response.headers.forEach((value, name) => out.push(name, value))
    res.writeHead(response.status, out)
    res.end(text)
  } catch (error) {
    // route() answers every error in the error shape; this is only for a failure outside it (a broken socket).
    console.error("[straightaway] a sample batch could not be answered", error)
    if (!res.headersSent) res.writeHead(500, { "content-type": "application/json" })
    res.end(JSON.stringify({ error: { code: "internal_error", message: "Something went wrong on our side." } }))
  }
}
