/// <reference lib="webworker" />
// Straightaway's service worker: the app shell and Next's static chunks are precached; pages and their data
// are served network-first with the last good copy kept, so the recorder opens with no network after one visit.
// Writes (POST) are never cached: the recorder's outbox in IndexedDB replays them.
import { clientsClaim } from "workbox-core"
import { ExpirationPlugin } from "workbox-expiration"
import { cleanupOutdatedCaches, precacheAndRoute } from "workbox-precaching"
import { registerRoute } from "workbox-routing"
import { CacheFirst, NetworkFirst } from "workbox-strategies"

declare const self: ServiceWorkerGlobalScope & { __WB_MANIFEST: Array<{ url: string; revision: string | null }> }

precacheAndRoute(self.__WB_MANIFEST)
cleanupOutdatedCaches()
clientsClaim()

// A waiting worker takes over only when the page asks (never in the middle of a drive).
self.addEventListener("message", (event) => {
  if (event.data?.type === "SKIP_WAITING") void self.skipWaiting()
})

const PAGES = "straightaway-pages"

// A page that redirected (to sign-in, say) must never be kept as the page that was asked for.
const notRedirected = {
  cacheWillUpdate: async ({ response }: { response: Response }) =>
    response.ok && !response.redirected ? response : null,
}

// The recorder keeps its drive in `?drive=`: every recorder address is served by the one saved /record page,
// which finds the drive in IndexedDB, so a reload in the middle of a drive with no network still opens it.
// Recorder pages live in a cache of their own that no expiry plugin manages: they are few, keyed by path, and
// losing one would strand a technician mid-drive.
const SHELL = "straightaway-shell"
const NETWORK_WAIT_MS = 4000

function shellKey(url: URL) {
  return url.pathname.replace(/\/$/, "") || "/record"
}

registerRoute(
  ({ request, url }) =>
    request.mode === "navigate" && url.origin === self.location.origin && url.pathname.startsWith("/record"),
  async ({ request, url }) => {
    const cache = await caches.open(SHELL)
    const key = shellKey(url)
    // NOTE: a navigation Request cannot be re-made with an init (no AbortSignal), so a slow network loses a race.
    const network = fetch(request).then(async (res) => {
      if (res.ok && !res.redirected && res.type === "basic") await cache.put(key, res.clone())
      return res
    })
    network.catch(() => {})
    const slow = new Promise<never>((_, reject) => setTimeout(() => reject(new Error("slow network")), NETWORK_WAIT_MS))
    const saved = async () =>
      (await cache.match(key, { ignoreVary: true })) ?? (await cache.match("/record", { ignoreVary: true }))
    try {
      const res = await Promise.race([network, slow])
      // The server up but its database not (a 503 page) or failing: the saved recorder still records offline.
      if (res.status >= 500) return (await saved()) ?? res
      return res
    } catch {
      return (await saved()) ?? Response.error()
    }
  },
)

registerRoute(
  ({ request, url }) => request.mode === "navigate" && url.origin === self.location.origin,
  new NetworkFirst({
    cacheName: PAGES,
    networkTimeoutSeconds: 4,
    matchOptions: { ignoreVary: true },
    plugins: [notRedirected, new ExpirationPlugin({ maxEntries: 60, maxAgeSeconds: 14 * 24 * 3600 })],
  }),
)

// Signed-in pages asked for by the app (the recorder, the co-driver page, the drive list), fetched so they open
// offline even if they were never visited on this phone. The answer (on the message's port) lists what is saved,
// so the app says "ready for offline" only once the recorder really is in the cache.
self.addEventListener("message", (event) => {
  if (event.data?.type !== "WARM" || !Array.isArray(event.data.urls)) return
  const reply = event.ports?.[0]
  event.waitUntil(
    (async () => {
      const saved: string[] = []
      for (const url of event.data.urls as string[]) {
        if (typeof url !== "string" || !url.startsWith("/")) continue
        try {
          const res = await fetch(url, { credentials: "same-origin" })
          const cache = await caches.open(url.startsWith("/record") ? SHELL : PAGES)
          if (res.ok && !res.redirected) {
            await cache.put(url, res)
            saved.push(url)
          }
        } catch {
          // offline: the next visit warms it
        }
      }
      reply?.postMessage({ type: "WARMED", saved })
    })(),
  )
})

// React Server Component payloads for client-side navigation between cached pages.
registerRoute(
  ({ request, url }) => url.origin === self.location.origin && request.headers.get("RSC") === "1",
  new NetworkFirst({
    cacheName: "straightaway-rsc",
    networkTimeoutSeconds: 4,
    plugins: [new ExpirationPlugin({ maxEntries: 120 })],
  }),
)

// Read-only API data the recorder needs offline (jobs, profiles, the drive list): last good copy.
registerRoute(
  ({ request, url }) =>
    request.method === "GET" &&
    url.origin === self.location.origin &&
    /^\/api\/(jobs|profiles|drives|session)(\/|$|\?)/.test(url.pathname) &&
    !/\/live$/.test(url.pathname), // the live channel streams: never through a cache
  new NetworkFirst({
    cacheName: "straightaway-api",
    networkTimeoutSeconds: 4,
    plugins: [notRedirected, new ExpirationPlugin({ maxEntries: 200 })],
  }),
)

registerRoute(
  ({ url }) => url.origin === self.location.origin && /\.(png|svg|ico|webmanifest)$/.test(url.pathname),
  new CacheFirst({ cacheName: "straightaway-assets", plugins: [new ExpirationPlugin({ maxEntries: 40 })] }),
)
