// The content security policy of every page: scripts only from this origin and with this response's nonce (Next puts
// the nonce on its own inline scripts when it finds it in the request's CSP header), no framing, no plugins.
// Style attributes stay allowed ('unsafe-inline' in style-src): React's style={…} and the chart library use them.

/**
 * `uploadOrigin`: the object store the browser PUTs photos to through presigned addresses (S3_ENDPOINT's origin);
 * without it in connect-src the upload itself would be refused.
 */
export function contentSecurityPolicy(
  nonce: string,
  { https, dev, uploadOrigin }: { https: boolean; dev: boolean; uploadOrigin?: string | null },
): string {
  return [
    "default-src 'self'",
    `script-src 'self' 'nonce-${nonce}' 'strict-dynamic'${dev ? " 'unsafe-eval'" : ""}`,
    "style-src 'self' 'unsafe-inline'",
    "img-src 'self' blob: data:",
    "font-src 'self'",
    `connect-src 'self'${uploadOrigin ? ` ${uploadOrigin}` : ""}`,
    "worker-src 'self'",
    "manifest-src 'self'",
    "media-src 'self' blob:",
    "object-src 'none'",
    "base-uri 'self'",
    "form-action 'self'",
    "frame-ancestors 'none'",
    ...(https ? ["upgrade-insecure-requests"] : []),
  ].join("; ")
}

/** HSTS for a year, only on answers that went out over HTTPS (RFC 6797 section 7.2: never over plain HTTP). */
export const STRICT_TRANSPORT_SECURITY = "max-age=31536000; includeSubDomains"

/**
 * Whether a request came over HTTPS: the request itself, a proxy that says so (only when proxies are trusted,
 * TRUST_PROXY), or an https APP_URL.
 */
export function servedOverHttps(
  url: string,
  headers: Pick<Headers, "get">,
  env: Record<string, string | undefined>,
): boolean {
  if (url.startsWith("https:")) return true
  if (env.TRUST_PROXY && env.TRUST_PROXY !== "0" && headers.get("x-forwarded-proto")?.split(",")[0]?.trim() === "https")
    return true
  return (env.APP_URL ?? "").startsWith("https:")
}

/** The origin of a configured object store address, or null when none is set or it is not a URL. */
export function originOf(url: string | undefined): string | null {
  if (!url) return null
  try {
    return new URL(url).origin
  } catch {
    return null
  }
}
