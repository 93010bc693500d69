// The method table of the API, read from the route files: which HTTP methods each app/api/**/route.ts exports.
// The proxy (proxy.ts) answers 405 with `Allow` from it, so no route file needs a line of its own for that. Handlers
// exported by destructuring (`export const { GET } = otherMethodsRefused(...)`, app/_server/route.ts) refuse a method
// where a request skips the proxy, and are not methods the route takes: the pattern below does not list them.
import fs from "node:fs"
import path from "node:path"

const METHODS = ["GET", "HEAD", "POST", "PUT", "PATCH", "DELETE", "OPTIONS"]
const EXPORT = /^export\s+(?:const|async\s+function|function)\s+(GET|HEAD|POST|PUT|PATCH|DELETE|OPTIONS)\b/gm

/** [{ pattern: "/api/drives/[driveId]/samples", methods: ["POST"] }, ...] sorted by pattern. */
export function scanApiRoutes(root) {
  const apiDir = path.join(root, "app", "api")
  const out = []
  const walk = (dir) => {
    for (const entry of fs.readdirSync(dir, { withFileTypes: true })) {
      const full = path.join(dir, entry.name)
      if (entry.isDirectory()) walk(full)
      else if (/^route\.(ts|tsx|js|mjs)$/.test(entry.name)) {
        const source = fs.readFileSync(full, "utf8")
        const methods = [...new Set([...source.matchAll(EXPORT)].map((m) => m[1]))].sort(
          (a, b) => METHODS.indexOf(a) - METHODS.indexOf(b),
        )
        const rel = path
          .relative(path.join(root, "app"), dir)
          .split(path.sep)
          .filter((s) => !/^\(.*\)$/.test(s))
        out.push({ pattern: `/${rel.join("/")}`, methods })
      }
    }
  }
  walk(apiDir)
  return out.sort((a, b) => (a.pattern < b.pattern ? -1 : a.pattern > b.pattern ? 1 : 0))
}

/** The table as JSON text, a route a line (proxy.ts and the tests import it, typed as ApiRoute[] there). */
export function renderApiRoutes(routes) {
  const lines = routes.map(
    (r) => `    { "pattern": ${JSON.stringify(r.pattern)}, "methods": ${JSON.stringify(r.methods)} }`,
  )
  return `{
  "generated": "by scripts/gen-api-routes.mjs from app/api/**/route.ts (run by npm run build; a unit test checks it is current); do not edit by hand",
  "routes": [
${lines.join(",\n")}
  ]
}
`
}

export const GENERATED_PATH = path.join("app", "_server", "api-routes.generated.json")
