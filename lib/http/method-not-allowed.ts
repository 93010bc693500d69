// The API's answer to a method a route does not take: 405 in the error shape with `Allow` (RFC 9110 section 15.5.6).

export function methodNotAllowed(method: string, allowed: readonly string[]): Response {
  return Response.json(
    {
      error: {
        code: "method_not_allowed",
        message: `${method} is not answered here; this address takes ${allowed.join(", ")}.`,
      },
    },
    { status: 405, headers: { "cache-control": "no-store", allow: allowed.join(", ") } },
  )
}
