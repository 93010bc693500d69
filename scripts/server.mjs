// The app's server: Next.js behind a plain node:http server (Next's "custom server"), which answers the recorder's
// sample batches itself (app/_server/early-routes.ts, bundled into the build by scripts/build-early.mjs) and hands
// every other request to Next. `npm start` and `npm test` run it as `node --max-semi-space-size=16 --heap-growing-percent=50 scripts/server.mjs`
// (SERVER_ARGS in scripts/lib/shell.mjs) with PORT and HOSTNAME.
import http from "node:http"
import path from "node:path"
import { pathToFileURL } from "node:url"
import next from "next"

const root = path.resolve(import.meta.dirname, "..")
const distDir = path.join(root, process.env.NEXT_DIST_DIR || ".next")
const port = Number(process.env.PORT ?? 3000)
const hostname = process.env.HOSTNAME ?? "127.0.0.1"

const app = next({ dev: false, dir: root, hostname, port })
const handle = app.getRequestHandler()
await app.prepare()
const { answerEarly } = await import(pathToFileURL(path.join(distDir, "early-routes.mjs")).href)

const server = http.createServer((req, res) => {
  if (!answerEarly(req, res)) void handle(req, res)
})
server.listen(port, hostname, () => {
  console.log(`[straightaway] serving on http://${hostname}:${port}`)
})

for (const signal of ["SIGINT", "SIGTERM"]) {
  process.on(signal, () => {
    server.close()
    server.closeAllConnections()
    process.exit(0)
  })
}
