// One place in front of every route (Next 16's proxy, formerly middleware):
// - /api answers stay in the error shape: 405 with `Allow` for a method the route file does not export (from the
//   generated table, app/_server/api-routes.generated.json), a JSON 404 for /API/… spelt in another case, a 400
//   for a path whose %-escapes are not UTF-8 text;
// - pages with such a path get the app's 404 page instead of a 500;
// - a page asked for while the database is not answering gets a calm page with a 503 and Retry-After (one probe
//   on the app's pool, db/availability.ts; the page is lib/http/unavailable-page.ts) instead of a failing render;
// - every page gets a content security policy with a fresh nonce (lib/http/security-headers.ts), and HSTS over HTTPS
//   (so do API answers, but for the sample batches that skip the proxy: see the matcher at the end).
import { NextResponse, type NextRequest } from "next/server"
import apiRoutes from "@/app/_server/api-routes.generated.json"
import { probeDatabase } from "@/db/availability"
import { allowedMethods, isWellFormedPath, matchApiRoute, type ApiRoute } from "@/lib/api-route-match"
import { methodNotAllowed } from "@/lib/http/method-not-allowed"
import {
  contentSecurityPolicy,
  originOf,
  servedOverHttps,
  STRICT_TRANSPORT_SECURITY,
} from "@/lib/http/security-headers"
import { unavailablePageHtml } from "@/lib/http/unavailable-page"

const API_ROUTES: readonly ApiRoute[] = apiRoutes.routes

function apiError(status: number, code: string, message: string, headers: Record<string, string> = {}) {
  return Response.json({ error: { code, message } }, { status, headers: { "cache-control": "no-store", ...headers } })
}

function overHttps(req: NextRequest) {
  return servedOverHttps(req.nextUrl.href, req.headers, process.env)
}

/** The page answer with its CSP (and the nonce handed to the render through the request headers). */
function page(req: NextRequest, answer: (init: { request: { headers: Headers } }) => NextResponse) {
  const nonce = Buffer.from(crypto.randomUUID()).toString("base64")
  const https = overHttps(req)
  const csp = contentSecurityPolicy(nonce, {
    https,
    dev: process.env.NODE_ENV === "development",
    uploadOrigin: originOf(process.env.S3_ENDPOINT),
  })
  const headers = new Headers(req.headers)
  headers.set("x-nonce", nonce)
  headers.set("content-security-policy", csp)
  const res = answer({ request: { headers } })
  res.headers.set("content-security-policy", csp)
  if (https) res.headers.set("strict-transport-security", STRICT_TRANSPORT_SECURITY)
  return res
}

/** Seconds a client is told to wait when the database is not answering (the API's 503s say the same). */
const DATABASE_RETRY_AFTER_SECONDS = "5"

/** Pages that need nothing from the database. */
const NEEDS_NO_DATABASE = new Set(["/manifest.webmanifest"])

export async function proxy(req: NextRequest) {
  const raw = req.nextUrl.pathname
  // next.config.mjs sets skipTrailingSlashRedirect so that the API never answers a bare 308: a trailing slash is a
  // 404 in the error shape there (below), and pages keep Next's usual permanent redirect.
  const pathname = raw.length > 1 && raw.endsWith("/") ? raw.replace(/\/+$/, "") || "/" : raw
  const isApi = pathname === "/api" || pathname.startsWith("/api/")
  if (!isApi && /^\/api(\/|$)/i.test(pathname)) return apiError(404, "not_found", "There is no such API route.")
  if (!isWellFormedPath(pathname)) {
    if (isApi) return apiError(400, "invalid_request", "The address is not valid: a %-escape in it is not UTF-8 text.")
    return page(req, (init) => NextResponse.rewrite(new URL("/_malformed-address", req.url), { ...init, status: 404 }))
  }
  if (isApi) {
    const route = matchApiRoute(pathname, API_ROUTES)
    if (!route) return apiError(404, "not_found", "There is no such API route.")
    const allowed = allowedMethods(route)
    if (!allowed.includes(req.method)) return methodNotAllowed(req.method, allowed)
  }
  if (pathname !== raw) {
    // Under /api a trailing slash is a 404 naming the address without it: a rewrite to that address left the request
    // unanswered (Next 16.4), and a 308 would be an answer outside the error shape. Pages keep their 308.
    if (isApi)
      return apiError(404, "not_found", `There is no such API route; the address has no trailing slash: ${pathname}`)
    const url = req.nextUrl.clone()
    url.pathname = pathname
    return NextResponse.redirect(url, 308)
  }
  if (isApi) {
    const res = NextResponse.next()
    if (overHttps(req)) res.headers.set("strict-transport-security", STRICT_TRANSPORT_SECURITY)
    return res
  }
  if (
    (req.method === "GET" || req.method === "HEAD") &&
    !NEEDS_NO_DATABASE.has(pathname) &&
    (await probeDatabase()) === "down"
  ) {
    // A rewrite cannot change a page's status, so the proxy answers itself (lib/http/unavailable-page.ts).
    return page(req, () => {
      const headers = {
        "content-type": "text/html; charset=utf-8",
        "retry-after": DATABASE_RETRY_AFTER_SECONDS,
        "cache-control": "no-store",
      }
      return new NextResponse(req.method === "HEAD" ? null : unavailablePageHtml(), { status: 503, headers })
    })
  }
  return page(req, (init) => NextResponse.next(init))
}

// A sample batch that names itself in its x-batch-id header skips the proxy: Next buffers the whole body of any
// request the proxy sees, and a replayed batch is answered from its claim before its body is read
// (app/_server/services/recording.ts). Only a plain id segment and an exact address skip it: a %-escape, a trailing
// slash or another case still meets the checks above, and the route file refuses other methods in the error shape.
export const config = {
  matcher: [
    "/((?!_next/static|_next/image|icons/|sw\\.js|favicon\\.ico|api/drives/[0-9A-Za-z-]+/samples$).*)",
    { source: "/api/drives/:driveId([0-9A-Za-z-]+)/samples", missing: [{ type: "header", key: "x-batch-id" }] },
  ],
}
