// Post-build step: bundles workers/sw.ts and injects the precache manifest of Next's static output into public/sw.js.
import path from "node:path"
import { build } from "esbuild"
import { injectManifest } from "workbox-build"

const root = path.resolve(import.meta.dirname, "..")
// Parallel development builds use their own folder (next.config.mjs distDir).
const distDir = path.join(root, process.env.NEXT_DIST_DIR || ".next")
const tmp = path.join(distDir, "sw-src.js")

await build({
  entryPoints: [path.join(root, "workers", "sw.ts")],
  bundle: true,
  format: "iife",
  target: "es2020",
  minify: true,
  outfile: tmp,
  define: { "process.env.NODE_ENV": '"production"' },
  logLevel: "warning",
})

const { count, size, warnings } = await injectManifest({
  swSrc: tmp,
  swDest: path.join(root, "public", "sw.js"),
  globDirectory: distDir,
  globPatterns: ["static/**/*.{js,css,woff2}"],
  modifyURLPrefix: { "static/": "/_next/static/" },
  maximumFileSizeToCacheInBytes: 5 * 1024 * 1024,
  // The app icons and manifest, so an installed app shows its icon offline too.
  additionalManifestEntries: [
    { url: "/icons/icon-192.png", revision: "1" },
    { url: "/icons/icon-512.png", revision: "1" },
    { url: "/icons/icon-maskable-512.png", revision: "1" },
  ],
})
for (const w of warnings) console.warn(`[sw] ${w}`)
console.log(`[straightaway] service worker: ${count} files precached (${Math.round(size / 1024)} KB)`)
