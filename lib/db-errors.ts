// Database failures that are not the request's fault, told apart by the driver's error (pg / PostgreSQL SQLSTATE).

type PgLike = { code?: unknown; message?: unknown; errno?: unknown; cause?: unknown; errors?: unknown }

const UNAVAILABLE_CODES = new Set([
  "ECONNREFUSED",
  "ECONNRESET",
  "ETIMEDOUT",
  "EPIPE",
  "ENOTFOUND",
  "EAI_AGAIN",
  "57P01", // admin_shutdown
  "57P02", // crash_shutdown
  "57P03", // cannot_connect_now (starting up or shutting down)
  "53300", // too_many_connections
])

const UNAVAILABLE_MESSAGES = [
  /Connection terminated/i,
  /timeout exceeded when trying to connect/i,
  /Client has encountered a connection error/i,
  /the database system is (starting up|shutting down)/i,
]

/** Whether an error means the database cannot be reached now (a 503), rather than a bug (a 500). */
export function isDatabaseUnavailable(error: unknown, depth = 0): boolean {
  if (!error || typeof error !== "object" || depth > 4) return false
  const e = error as PgLike
  if (typeof e.code === "string" && (UNAVAILABLE_CODES.has(e.code) || e.code.startsWith("08"))) return true
  if (typeof e.message === "string" && UNAVAILABLE_MESSAGES.some((re) => re.test(e.message as string))) return true
  if (Array.isArray(e.errors) && e.errors.some((x) => isDatabaseUnavailable(x, depth + 1))) return true // AggregateError (IPv4 + IPv6)
  return isDatabaseUnavailable(e.cause, depth + 1)
}

/** A unique constraint refused the row (SQLSTATE 23505): the thing exists already, a 409. */
export function isUniqueViolation(error: unknown): boolean {
  return (error as PgLike | null)?.code === "23505"
}

/** What a 409 says for the unique constraints a person can run into at once (two admins, one e-mail). */
const UNIQUE_MESSAGES: Record<string, { message: string; fields: Record<string, string> }> = {
  app_user_email_key: { message: "Someone already signs in with that e-mail.", fields: { email: "is already in use" } },
}

export function uniqueViolationAnswer(error: unknown): { message: string; fields?: Record<string, string> } {
  const constraint = (error as { constraint?: unknown } | null)?.constraint
  return (
    (typeof constraint === "string" && UNIQUE_MESSAGES[constraint]) || {
      message: "That exists already (made by another request at the same time).",
    }
  )
}
