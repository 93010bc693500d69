"use client"

import { ArrowLeft, Sun, SunDim } from "lucide-react"
import { useEffect, useState, type ReactNode } from "react"

// No cn() (tailwind-merge) here: this wraps the recorder, whose first load has a budget (recorderFirstLoadKbGzip).

const KEY = "straightaway.sun"

/**
 * The recorder's root: the dark cab theme, or sun mode (a high-contrast light theme, app/(cab)/sun.css) for
 * bright daylight. The choice stays on the phone.
 */
export function CabRoot({ children }: { children: ReactNode }) {
  const [sun, setSun] = useState(false)
  useEffect(() => {
    // localStorage is only readable after mount; the first paint is the cab theme.
    setSun(window.localStorage.getItem(KEY) === "1")
  }, [])
  useEffect(() => {
    document.querySelector('meta[name="theme-color"]')?.setAttribute("content", sun ? "#ffffff" : "#17181a")
  }, [sun])
  function toggle() {
    const next = !sun
    setSun(next)
    try {
      window.localStorage.setItem(KEY, next ? "1" : "0")
    } catch {
      // private mode: the choice lasts this visit
    }
  }
  return (
    <div className={`dark min-h-dvh bg-asphalt-900 text-graphite-50${sun ? " sun" : ""}`} data-theme={sun ? "sun" : "cab"} data-testid="cab-root">
      <div className="mx-auto flex max-w-xl items-center justify-between gap-2 px-3 pt-[max(0.5rem,env(safe-area-inset-top))]">
        {/* The way out of the full-screen recorder; a drive being recorded carries on and reopens from Record. */}
        <a href="/" className="inline-flex min-h-12 items-center gap-2 rounded-lg px-2 text-sm font-semibold text-graphite-50" data-testid="leave-recorder">
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
