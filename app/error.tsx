"use client"

import { Logo } from "@/components/shell/logo"

/**
 * A page whose render failed (the database lost mid-render is the usual cause: proxy.ts answers a 503 page when it
 * is down before the render starts). No details of the error are shown; the server log has them.
 */
export default function PageError({ reset }: { error: Error & { digest?: string }; reset: () => void }) {
  return (
    <main
      className="mx-auto flex min-h-dvh max-w-md flex-col items-start justify-center gap-4 px-4"
      data-testid="page-error"
    >
      <Logo className="size-10" />
      <h1 className="text-2xl font-bold">This page did not load</h1>
      <p>Something on our side did not answer. Nothing you saved is lost; try again in a few seconds.</p>
      <button
        type="button"
        onClick={() => reset()}
        className="inline-flex min-h-12 items-center gap-2 rounded-lg bg-graphite-900 px-4 font-semibold text-white dark:bg-signal-400 dark:text-graphite-950"
      >
        {/* Drawn here rather than taken from the icon set: this boundary's code loads with every page. */}
        <svg
          aria-hidden
          viewBox="0 0 24 24"
          fill="none"
          stroke="currentColor"
          strokeWidth={2}
          strokeLinecap="round"
          strokeLinejoin="round"
          className="size-5"
        >
          <path d="M21 12a9 9 0 1 1-9-9c2.52 0 4.93 1 6.74 2.74L21 8" />
          <path d="M21 3v5h-5" />
        </svg>{" "}
        Try again
      </button>
    </main>
  )
}
