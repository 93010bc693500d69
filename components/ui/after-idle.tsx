"use client"
import { Suspense, useEffect, useState, type ReactNode } from "react"

/** Resolves once the browser is idle (at most 1 s later): for code a screen does not wait for. */
export function afterIdle(): Promise<void> {
  return new Promise<void>((done) => {
    if ("requestIdleCallback" in window) requestIdleCallback(() => done(), { timeout: 1000 })
    else setTimeout(done, 200)
  })
}

/**
 * Renders its (lazy) children only once the page is idle, so that their code is fetched after the screen works
 * and never counts against its first load. Nothing shows until then.
 */
export function AfterIdle({ children }: { children: ReactNode }) {
  const [idle, setIdle] = useState(false)
  useEffect(() => {
    let live = true
    void afterIdle().then(() => {
      if (live) setIdle(true)
    })
    return () => {
      live = false
    }
  }, [])
  return idle ? <Suspense fallback={null}>{children}</Suspense> : null
}
