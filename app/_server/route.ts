import "server-only"
import { randomUUID } from "node:crypto"
import { z } from "zod"
import { AppError } from "@/lib/errors"
import { findUnstorableText, unstorableTextProblem } from "@/lib/validation/storable"
import { issuesToFields } from "@/lib/validation/zod-fields"

type Ctx<P> = { params: Promise<P> }
type Handler<P> = (req: Request, ctx: Ctx<P>) => Promise<Response>

/**
 * Every route handler goes through here: the Origin check for writes, AppError -> its status and the
 * API's error shape, and anything unexpected -> a generic 500 logged with a request id.
 */
export function route<P = Record<string, string>>(handler: Handler<P>): Handler<P> {
  return async (req, ctx) => {
    try {
      assertSameOrigin(req)
      return await handler(req, ctx)
    } catch (error) {
      if (error instanceof AppError) {
        return Response.json(error.toBody(), { status: error.status, headers: error.headers })
      }
      if (isNextControlFlow(error)) throw error
      const requestId = randomUUID()
      console.error(`[straightaway] request ${requestId} ${req.method} ${new URL(req.url).pathname} failed`, error)
      return Response.json(
        { error: { code: "internal_error", message: `Something went wrong on our side (request ${requestId}).` } },
        { status: 500 },
      )
    }
  }
}

function isNextControlFlow(error: unknown) {
  const digest = (error as { digest?: unknown } | null)?.digest
  return typeof digest === "string" && (digest.startsWith("NEXT_") || digest === "DYNAMIC_SERVER_USAGE")
}

const SAFE_METHODS = new Set(["GET", "HEAD", "OPTIONS"])

function assertSameOrigin(req: Request) {
  if (SAFE_METHODS.has(req.method)) return
  const origin = req.headers.get("origin")
  if (!origin) return // not a browser form or fetch across sites (curl, integrations with a cookie they hold)
  const host = req.headers.get("x-forwarded-host") ?? req.headers.get("host")
  let originHost: string
  try {
    originHost = new URL(origin).host
  } catch {
    throw new AppError("forbidden", "Requests from other sites are refused.")
  }
  if (!host || originHost !== host) throw new AppError("forbidden", "Requests from other sites are refused.")
}

const MAX_JSON_BYTES = 8 * 1024 * 1024

/** Reads a JSON body and validates it; malformed JSON and schema failures are 400s naming the fields. */
export async function parseJson<S extends z.ZodType>(
  req: Request,
  schema: S,
  { maxBytes = MAX_JSON_BYTES, emptyAs }: { maxBytes?: number; emptyAs?: unknown } = {},
): Promise<z.infer<S>> {
  const body = await readJson(req, maxBytes, emptyAs)
  return parseWith(schema, body)
}

/** `emptyAs`: what an empty body means, for routes whose every field is optional; without it an empty body is a 400. */
export async function readJson(req: Request, maxBytes = MAX_JSON_BYTES, emptyAs?: unknown): Promise<unknown> {
  return jsonFromText(await readBodyText(req, maxBytes), emptyAs)
}

/** The body as text, refused over `maxBytes` (a route that looks at the text before parsing it). */
export async function readBodyText(req: Request, maxBytes = MAX_JSON_BYTES): Promise<string> {
  const declared = Number(req.headers.get("content-length") ?? 0)
  if (declared > maxBytes) throw new AppError("too_large", `The body is over ${Math.round(maxBytes / 1024 / 1024)} MB.`)
  const text = await req.text()
  if (Buffer.byteLength(text) > maxBytes) throw new AppError("too_large", `The body is over ${Math.round(maxBytes / 1024 / 1024)} MB.`)
  return text
}

/** readJson's parsing and storable-text check, for a body already read with readBodyText. */
export function jsonFromText(text: string, emptyAs?: unknown): unknown {
  if (!text.trim()) {
    if (emptyAs !== undefined) return emptyAs
    throw new AppError("invalid_request", "The request body is empty; JSON was expected.")
  }
  let body: unknown
  try {
    body = JSON.parse(text)
  } catch {
    throw new AppError("invalid_request", "The request body is not valid JSON.")
  }
  // Before any schema: text the database cannot store as sent is a 400, not a 500 or a silent change.
  const unstorable = findUnstorableText(body)
  if (unstorable) throw new AppError("validation_failed", `${unstorable.path}: ${unstorable.problem}`, { [unstorable.path]: unstorable.problem })
  return body
}

export function parseWith<S extends z.ZodType>(schema: S, value: unknown): z.infer<S> {
  const result = schema.safeParse(value)
  if (result.success) return result.data
  const fields = issuesToFields(result.error.issues)
  const [path, problem] = Object.entries(fields)[0] ?? ["(body)", "is invalid"]
  throw new AppError("validation_failed", `${path}: ${problem}`, fields)
}

/** Route params and query strings are input too. */
export async function parseParams<S extends z.ZodType>(params: Promise<unknown>, schema: S): Promise<z.infer<S>> {
  const values = await params
  const unstorable = findUnstorableText(values)
  if (unstorable) throw new AppError("not_found", "That was not found.")
  const result = schema.safeParse(values)
  if (!result.success) throw new AppError("not_found", "That was not found.")
  return result.data
}

export function parseQuery<S extends z.ZodType>(req: Request, schema: S): z.infer<S> {
  const query = Object.fromEntries(new URL(req.url).searchParams)
  for (const [key, value] of Object.entries(query)) {
    const problem = unstorableTextProblem(key) ?? unstorableTextProblem(value)
    if (problem) throw new AppError("validation_failed", `${key}: ${problem}`, { [key]: problem })
  }
  return parseWith(schema, query)
}

export const uuidParam = z.string().uuid()
