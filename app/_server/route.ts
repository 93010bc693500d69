import "server-only"
import { randomUUID } from "node:crypto"
import { z } from "zod"
import { isDatabaseUnavailable, isUniqueViolation, uniqueViolationAnswer } from "@/lib/db-errors"
import { env } from "@/lib/env"
import { AppError } from "@/lib/errors"
import { isAppOrigin } from "@/lib/http/app-origin"
import { methodNotAllowed } from "@/lib/http/method-not-allowed"
import { BodyTooLargeError, jsonNestsDeeperThan, MAX_JSON_DEPTH, readBodyText } from "@/lib/validation/json-body"
import { findUnstorableText, unstorableTextProblem } from "@/lib/validation/storable"
import { issuesToFields } from "@/lib/validation/zod-fields"
import { uuidSchema } from "@/lib/validation/uuid"

type Ctx<P> = { params: Promise<P> }
type Handler<P> = (req: Request, ctx: Ctx<P>) => Promise<Response>

/** An answer in the API's JSON shape, before it is a Response (the app's server writes it to node:http itself). */
export interface JsonAnswer {
  status: number
  body: unknown
  headers?: Record<string, string>
}

/**
 * Every route handler goes through here: the Origin check for writes, AppError -> its status and the
 * API's error shape, and anything unexpected -> a generic 500 logged with a request id (errorAnswer).
 */
export function route<P = Record<string, string>>(handler: Handler<P>): Handler<P> {
  return async (req, ctx) => {
    try {
      assertSameOrigin(req.method, req.headers.get("origin"))
      return await handler(req, ctx)
    } catch (error) {
      const answer = errorAnswer(error, req.method, req.url)
      return Response.json(answer.body, { status: answer.status, headers: answer.headers })
    }
  }
}

/**
 * What route() answers for an error a handler threw: an AppError in its status and the error shape, the database
 * down a 503, a unique violation a 409, anything else a 500 logged with a request id. Next's own control flow
 * (redirect(), notFound()) is thrown on.
 */
export function errorAnswer(error: unknown, method: string, url: string): JsonAnswer {
  if (error instanceof AppError) return { status: error.status, body: error.toBody(), headers: error.headers }
  if (isNextControlFlow(error)) throw error
  if (isDatabaseUnavailable(error)) {
    console.error(
      `[straightaway] ${method} ${new URL(url).pathname}: the database is unavailable`,
      (error as Error).message,
    )
    return {
      status: 503,
      body: {
        error: { code: "service_unavailable", message: "The database is not answering right now; try again shortly." },
      },
      headers: { "Retry-After": String(DATABASE_RETRY_AFTER_SECONDS) },
    }
  }
  if (isUniqueViolation(error)) {
    // Two requests made the same thing at once and the database kept one: the other is a conflict, not a bug.
    const { message, fields } = uniqueViolationAnswer(error)
    return { status: 409, body: { error: { code: "conflict", message, ...(fields ? { fields } : {}) } } }
  }
  const requestId = randomUUID()
  console.error(`[straightaway] request ${requestId} ${method} ${new URL(url).pathname} failed`, error)
  return {
    status: 500,
    body: { error: { code: "internal_error", message: `Something went wrong on our side (request ${requestId}).` } },
  }
}

/**
 * Answers for the methods a route does not take, for a route that some requests reach without the proxy (proxy.ts,
 * which answers them for every other route): 405 in the error shape with `Allow`, and OPTIONS as Next answers it.
 * A route file exports them by destructuring, `export const { GET, ... } = otherMethodsRefused(["POST"])`, which the
 * route table (scripts/lib/api-routes.mjs) does not count among the methods the route takes.
 */
export function otherMethodsRefused(takes: readonly string[]) {
  const allowed = [...takes, "OPTIONS"]
  const refuse = async (req: Request) => methodNotAllowed(req.method, allowed)
  const options = async () => new Response(null, { status: 204, headers: { allow: [...allowed].sort().join(", ") } })
  return { GET: refuse, HEAD: refuse, PUT: refuse, PATCH: refuse, DELETE: refuse, OPTIONS: options }
}

function isNextControlFlow(error: unknown) {
  const digest = (error as { digest?: unknown } | null)?.digest
  return typeof digest === "string" && (digest.startsWith("NEXT_") || digest === "DYNAMIC_SERVER_USAGE")
}

const DATABASE_RETRY_AFTER_SECONDS = 5

const SAFE_METHODS = new Set(["GET", "HEAD", "OPTIONS"])

/**
 * Writes from a browser must come from the app's own public address (APP_URL, or its other loopback names when it is
 * served on one: lib/http/app-origin.ts); proxy headers are not consulted.
 */
export function assertSameOrigin(method: string, origin: string | null) {
  if (SAFE_METHODS.has(method)) return
  if (!origin) return // not a browser form or fetch across sites (curl, integrations with a cookie they hold)
  if (!isAppOrigin(origin, env().APP_URL)) throw new AppError("forbidden", "Requests from other sites are refused.")
}

export const MAX_JSON_BYTES = 8 * 1024 * 1024

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
  return jsonFromText(await readRequestText(req, maxBytes), emptyAs)
}

/**
 * The body as text, counted while it streams (a chunked body has no Content-Length to check beforehand):
 * over `maxBytes` a 413. For routes that look at the text before parsing it.
 */
export async function readRequestText(req: Request, maxBytes = MAX_JSON_BYTES): Promise<string> {
  const declared = req.headers.get("content-length")
  return bodyTextAnswering(() => readBodyText(req.body, maxBytes, declared === null ? undefined : Number(declared)))
}

/** A body's text as `read` gives it, its failures as the API answers them: too large a 413, unreadable a 400. */
export async function bodyTextAnswering(read: () => Promise<string>): Promise<string> {
  try {
    return await read()
  } catch (error) {
    if (error instanceof BodyTooLargeError)
      throw new AppError("too_large", `The body is over ${Math.round(error.maxBytes / 1024 / 1024)} MB.`)
    throw new AppError("invalid_request", "The request body could not be read.")
  }
}

/** readJson's parsing and checks (nesting depth, storable text), for a body already read with readRequestText. */
export function jsonFromText(text: string, emptyAs?: unknown): unknown {
  if (jsonNestsDeeperThan(text, MAX_JSON_DEPTH)) {
    throw new AppError("invalid_request", `The request body nests deeper than ${MAX_JSON_DEPTH} levels.`)
  }
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
  if (unstorable)
    throw new AppError("validation_failed", `${unstorable.path}: ${unstorable.problem}`, {
      [unstorable.path]: unstorable.problem,
    })
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

export const uuidParam = uuidSchema
