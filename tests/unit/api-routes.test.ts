import fs from "node:fs"
import path from "node:path"
import { describe, expect, it } from "vitest"
import apiRoutes from "@/app/_server/api-routes.generated.json"
import { allowedMethods, isWellFormedPath, matchApiRoute, type ApiRoute } from "@/lib/api-route-match"
// @ts-expect-error: a plain .mjs build script without types
import { GENERATED_PATH, renderApiRoutes, scanApiRoutes } from "../../scripts/lib/api-routes.mjs"

const root = path.resolve(import.meta.dirname, "..", "..")
const API_ROUTES: readonly ApiRoute[] = apiRoutes.routes

describe("the API method table", () => {
  it("is current with the route files (regenerate: node scripts/gen-api-routes.mjs)", () => {
    expect(fs.readFileSync(path.join(root, GENERATED_PATH), "utf8")).toBe(renderApiRoutes(scanApiRoutes(root)))
  })

  it("matches paths the way Next picks the route file", () => {
    expect(matchApiRoute("/api/drives/import", API_ROUTES)?.pattern).toBe("/api/drives/import")
    expect(matchApiRoute("/api/drives/abc", API_ROUTES)?.pattern).toBe("/api/drives/[driveId]")
    expect(matchApiRoute("/api/drives/abc/marks/def", API_ROUTES)?.pattern).toBe("/api/drives/[driveId]/marks/[markId]")
    expect(matchApiRoute("/api/drives/abc/nothing", API_ROUTES)?.pattern).toBe("/api/[...path]")
    expect(matchApiRoute("/api", API_ROUTES)).toBeNull()
    expect(allowedMethods(matchApiRoute("/api/session", API_ROUTES)!)).toEqual([
      "GET",
      "POST",
      "DELETE",
      "HEAD",
      "OPTIONS",
    ])
    expect(allowedMethods(matchApiRoute("/api/drives/x/samples", API_ROUTES)!)).toEqual(["POST", "OPTIONS"])
  })
})

describe("isWellFormedPath", () => {
  it("refuses %-escapes that are not UTF-8 text", () => {
    expect(isWellFormedPath("/api/drives/%")).toBe(false)
    expect(isWellFormedPath("/api/drives/%E0%A4%A")).toBe(false)
    expect(isWellFormedPath("/api/drives/%ED%A0%80")).toBe(false) // an encoded lone surrogate
    expect(isWellFormedPath("/api/drives/a%00b")).toBe(false)
    expect(isWellFormedPath("/api/vin/%E0%A4%A8")).toBe(true)
    expect(isWellFormedPath("/share/abc.def")).toBe(true)
  })
})
