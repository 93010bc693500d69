// Post-build step: bundles app/_server/early-routes.ts (the requests the app's server answers before Next.js) into
// the build folder, for scripts/server.mjs. Packages stay in node_modules, loaded as the app loads them; the app's
// own modules share their state with Next's copies through globalThis (the database pools, the live hub).
import path from "node:path"
import { build } from "esbuild"

const root = path.resolve(import.meta.dirname, "..")
const distDir = path.join(root, process.env.NEXT_DIST_DIR || ".next")

await build({
  entryPoints: [path.join(root, "app", "_server", "early-routes.ts")],
  bundle: true,
  platform: "node",
  format: "esm",
  target: "node20",
  packages: "external",
  outfile: path.join(distDir, "early-routes.mjs"),
  logLevel: "warning",
  plugins: [
    {
      // `server-only` keeps these modules out of browser bundles; outside Next's react-server build it would throw.
      name: "server-only",
      setup(b) {
        b.onResolve({ filter: /^server-only$/ }, () => ({ path: "server-only", namespace: "empty" }))
        b.onLoad({ filter: /.*/, namespace: "empty" }, () => ({ contents: "", loader: "js" }))
      },
    },
    {
      // Next's entry points have no package exports map, which Node's ESM loader needs for a bare `next/headers`.
      // Modules on this path import them without calling them here (but revisions.ts's after(), which falls back).
      name: "next-entry-points",
      setup(b) {
        b.onResolve({ filter: /^next\/[a-z-]+$/ }, (args) => ({ path: `${args.path}.js`, external: true }))
      },
    },
  ],
})
