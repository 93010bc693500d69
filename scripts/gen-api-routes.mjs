// Writes app/_server/api-routes.generated.json: the methods each API route file exports (see scripts/lib/api-routes.mjs).
import fs from "node:fs"
import path from "node:path"
import { GENERATED_PATH, renderApiRoutes, scanApiRoutes } from "./lib/api-routes.mjs"

const root = path.resolve(import.meta.dirname, "..")
const target = path.join(root, GENERATED_PATH)
const text = renderApiRoutes(scanApiRoutes(root))
if (!fs.existsSync(target) || fs.readFileSync(target, "utf8") !== text) fs.writeFileSync(target, text)
