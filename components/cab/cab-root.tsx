"use client"

import { ArrowLeft, Sun, SunDim } from "lucide-react"
import { useEffect, useSyncExternalStore, type ReactNode } from "react"

// No cn() (tailwind-merge) here: this wraps the recorder, whose first load has a budget (recorderFirstLoadKbGzip).

const KEY = "straightaway.sun"

// The choice lives in localStorage (this visit only, when storage is refused); read it as an external store so the
// server and the first paint are the cab theme and the phone's choice follows without an effect.
let choiceThisVisit: boolean | null = null
const listeners = new Set<() => void>()
function subscribe(onChange: () => void) {
  listeners.add(onChange)
  window.addEventListener("storage", onChange)
  return () => {
    listeners.delete(onChange)
    window.removeEventListener("storage", onChange)
  }
}
function readSun(): boolean {
  if (choiceThisVisit !== null) return choiceThisVisit
  try {
    return window.localStorage.getItem(KEY) === "1"
  } catch {
    return false
  }
}
function chooseSun(next: boolean) {
  choiceThisVisit = next
  try {
    window.localStorage.setItem(KEY, next ? "1" : "0")
  } catch {
    // private mode: the choice lasts this visit
  }
  for (const listener of listeners) listener()
}

/**
 * The recorder's root: the dark cab theme, or sun mode (a high-contrast light theme, app/(cab)/sun.css) for
 * bright daylight. The choice stays on the phone.
 */
export function CabRoot({ children }: { children: ReactNode }) {
  const sun = useSyncExternalStore(subscribe, readSun, () => false)
  useEffect(() => {
    document.querySelector('meta[name="theme-color"]')?.setAttribute("content", sun ? "#ffffff" : "#17181a")
  }, [sun])
  const toggle = () => chooseSun(!sun)
  return (
    <div
      className={
        sun ? "dark sun min-h-dvh bg-asphalt-900 text-graphite-50" : "dark min-h-dvh bg-asphalt-900 text-graphite-50"
      }
      data-theme={sun ? "sun" : "cab"}
      data-testid="cab-root"
    >
      <div className="mx-auto flex max-w-xl items-center justify-between gap-2 px-3 pt-[max(0.5rem,env(safe-area-inset-top))]">
        {/* The way out of the full-screen recorder; a drive being recorded carries on and reopens from Record. */}
        <a
          href="/"
          className="inline-flex min-h-12 items-center gap-2 rounded-lg px-2 text-sm font-semibold text-graphite-50"
          data-testid="leave-recorder"
        >
          <ArrowLeft aria-hidden className="size-5" /> Back to the app
        </a>
        <SunToggle sun={sun} onToggle={toggle} />
      </div>
      {children}
    </div>
  )
}

function SunToggle({ sun, onToggle }: { sun: boolean; onToggle: () => void }) {
  const Icon = sun ? SunDim : Sun
  return (
    <button
      type="button"
      onClick={onToggle}
      aria-pressed={sun}
      className="inline-flex min-h-12 items-center gap-2 rounded-lg border-2 border-graphite-400 px-3 text-sm font-semibold text-graphite-50"
      data-testid="sun-toggle"
    >
      <Icon aria-hidden className="size-5" /> Sun mode {sun ? "on" : "off"}
    </button>
  )
}
