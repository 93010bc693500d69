export type ErrorCode =
  | "invalid_request"
  | "validation_failed"
  | "not_signed_in"
  | "forbidden"
  | "not_found"
  | "conflict"
  | "too_large"
  | "too_many_attempts"
  | "method_not_allowed"
  | "service_unavailable"
  | "internal_error"

const STATUS: Record<ErrorCode, number> = {
  invalid_request: 400,
  validation_failed: 400,
  not_signed_in: 401,
  forbidden: 403,
  not_found: 404,
  conflict: 409,
  too_large: 413,
  too_many_attempts: 429,
  method_not_allowed: 405,
  service_unavailable: 503,
  internal_error: 500,
}

export type ErrorBody = { error: { code: ErrorCode; message: string; fields?: Record<string, string> } }

export class AppError extends Error {
  constructor(
    readonly code: ErrorCode,
    message: string,
    readonly fields?: Record<string, string>,
    readonly headers?: Record<string, string>,
  ) {
    super(message)
    this.name = "AppError"
  }

  get status() {
    return STATUS[this.code]
  }

  toBody(): ErrorBody {
    return { error: { code: this.code, message: this.message, ...(this.fields ? { fields: this.fields } : {}) } }
  }
}

export function notFound(what = "That"): never {
  throw new AppError("not_found", `${what} was not found.`)
}

export function validationFailed(fields: Record<string, string>, message?: string): never {
  const first = Object.entries(fields)[0]
  throw new AppError("validation_failed", message ?? (first ? `${first[0]}: ${first[1]}` : "Invalid input."), fields)
}
