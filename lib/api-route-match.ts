// Which methods an API path answers, from the generated route table (app/_server/api-routes.generated.json).
// Next's own order decides which file serves a path: static segments before [dynamic] before [...catchAll].

export type ApiRoute = { pattern: string; methods: readonly string[] }

/** Segment ranks, lower is more specific; null when the pattern does not match the path. */
function matchRank(pattern: string, segments: string[]): number[] | null {
  const parts = pattern.split("/").filter(Boolean)
  const rank: number[] = []
  for (let i = 0; i < parts.length; i++) {
    const part = parts[i]!
    if (part.startsWith("[...") || part.startsWith("[[...")) {
      if (segments.length <= i && !part.startsWith("[[")) return null
      rank.push(2)
      return rank
    }
    const segment = segments[i]
    if (segment === undefined) return null
    if (part.startsWith("[")) rank.push(1)
    else if (part === segment) rank.push(0)
    else return null
  }
  return segments.length === parts.length ? rank : null
}

function compareRanks(a: number[], b: number[]) {
  for (let i = 0; i < Math.min(a.length, b.length); i++) if (a[i] !== b[i]) return a[i]! - b[i]!
  return b.length - a.length
}

/** The route file that serves `pathname`, or null. */
export function matchApiRoute(pathname: string, routes: readonly ApiRoute[]): ApiRoute | null {
  const segments = pathname.split("/").filter(Boolean)
  let best: { route: ApiRoute; rank: number[] } | null = null
  for (const route of routes) {
    const rank = matchRank(route.pattern, segments)
    if (rank && (!best || compareRanks(rank, best.rank) < 0)) best = { route, rank }
  }
  return best?.route ?? null
}

/** The methods a route answers, as Next serves them: HEAD with GET, OPTIONS always. */
export function allowedMethods(route: ApiRoute): string[] {
  const out = new Set(route.methods)
  if (out.has("GET")) out.add("HEAD")
  out.add("OPTIONS")
  return [...out]
}

/** Whether every %-escape in a path decodes to well-formed UTF-8 text without NUL (lone surrogates refused too). */
export function isWellFormedPath(pathname: string): boolean {
  for (const segment of pathname.split("/")) {
    let decoded: string
    try {
      decoded = decodeURIComponent(segment)
    } catch {
      return false
    }
    if (decoded.includes("\u0000")) return false
    const wellFormed = (decoded as { isWellFormed?: () => boolean }).isWellFormed
    if (wellFormed && !wellFormed.call(decoded)) return false
  }
  return true
}
