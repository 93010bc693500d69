"use client"
import { usePathname } from "next/navigation"
import { lazy, Suspense, useEffect, useState } from "react"
import type { Workbox } from "workbox-window"
import { getActiveDrive } from "@/lib/recorder/idb-outbox"

/** Pages the recorder needs with no network, fetched into the worker's cache once signed in. */
const WARM_URLS = ["/record", "/drives"]

/** How long the worker may take to answer one request to save the pages (it fetches them first). */
const WARM_ANSWER_MS = 10_000

/** How long after the page's `load` the worker is registered (then at the next idle moment). */
const AFTER_LOAD_MS = 1500

/** The offer to reload into a new version: loaded only when there is one. */
const UpdateOffer = lazy(() => import("./update-offer").then((m) => ({ default: m.UpdateOffer })))

/** Pages where nobody is signed in yet: warming there would only save the sign-in redirect. */
const SIGNED_OUT_PATHS = /^\/(sign-in|share)(\/|$)/

/**
 * A message to the worker that is active for this page, and its answer. Not `Workbox.messageSW`: that waits for
 * the worker *this* Workbox instance installed, and a page loaded while an earlier page's worker was still
 * installing or activating never learns of one, so its message would never go out (and the page never offline-ready).
 */
async function askActiveWorker(data: object) {
  const [{ messageSW }, registration] = await Promise.all([import("workbox-window"), navigator.serviceWorker.ready])
  return messageSW(registration.active!, data)
}

/**
 * Registers /sw.js. When a new worker is waiting it offers a reload, but never while a drive is
 * being recorded on this phone (the offer waits until the drive is finished).
 */
export function ServiceWorkerRegistration() {
  const [wb, setWb] = useState<Workbox | null>(null)
  const [waiting, setWaiting] = useState(false)
  const [driving, setDriving] = useState(true)
  const [offlineReady, setOfflineReady] = useState(false)
  const pathname = usePathname()

  useEffect(() => {
    if (!("serviceWorker" in navigator) || process.env.NODE_ENV !== "production") return
    // Loaded once the page is up and idle, so it never weighs on the recorder's first load.
    let gone = false
    const register = () =>
      void import("workbox-window").then(({ Workbox }) => {
        if (gone) return
        const workbox = new Workbox("/sw.js", { scope: "/" })
        workbox.addEventListener("waiting", () => setWaiting(true))
        // Messages go out only once the registration exists (an earlier one could reach no worker at all).
        void workbox.register().then(() => {
          if (!gone) setWb(workbox)
        })
      })
    // A page's first screen may still be on its way after `load` (the recorder's waits on IndexedDB to know whether a
    // drive is to be resumed), and the main thread is idle meanwhile: the worker waits a little past `load` too, so
    // its script and registration never compete with that screen on a slow phone.
    let timer: ReturnType<typeof setTimeout> | undefined
    const whenIdle = () => {
      timer = setTimeout(
        () =>
          "requestIdleCallback" in window
            ? requestIdleCallback(register, { timeout: 2000 })
            : setTimeout(register, 200),
        AFTER_LOAD_MS,
      )
    }
    if (document.readyState === "complete") whenIdle()
    else window.addEventListener("load", whenIdle, { once: true })
    return () => {
      gone = true
      clearTimeout(timer)
      window.removeEventListener("load", whenIdle)
    }
  }, [])

  // Once signed in (any page but sign-in and share, including after a client-side move from sign-in), the worker
  // saves the recorder pages, this very /record… page among them; "ready for offline" (data-offline-ready on <html>)
  // only when it answers that /record is saved. An answer that is lost, late or without /record (a worker still
  // installing, a failed fetch) is asked again with a growing pause, and again on each move, until it is saved.
  useEffect(() => {
    if (!wb || !pathname || SIGNED_OUT_PATHS.test(pathname)) return
    const ownRecorderPage = pathname.startsWith("/record/")
    if (offlineReady && !ownRecorderPage) return
    const urls = ownRecorderPage ? [...WARM_URLS, pathname] : WARM_URLS
    let cancelled = false
    let timer: ReturnType<typeof setTimeout> | undefined
    const ask = async (attempt: number) => {
      const answer = await Promise.race([
        askActiveWorker({ type: "WARM", urls }) as Promise<{ saved?: string[] } | undefined>,
        new Promise<undefined>((resolve) => setTimeout(resolve, WARM_ANSWER_MS)),
      ]).catch(() => undefined)
      if (cancelled) return
      if (answer?.saved?.includes("/record")) {
        document.documentElement.dataset.offlineReady = "1"
        setOfflineReady(true)
        return
      }
      timer = setTimeout(() => void ask(attempt + 1), Math.min(1000 * 2 ** attempt, 15_000))
    }
    void ask(0)
    return () => {
      cancelled = true
      if (timer) clearTimeout(timer)
    }
  }, [wb, pathname, offlineReady])

  useEffect(() => {
    if (!waiting) return
    const check = () => void getActiveDrive().then((id) => setDriving(Boolean(id)))
    check()
    const timer = setInterval(check, 5000)
    return () => clearInterval(timer)
  }, [waiting])

  if (!waiting || driving || !wb) return null
  return (
    <Suspense fallback={null}>
      <UpdateOffer workbox={wb} />
    </Suspense>
  )
}
