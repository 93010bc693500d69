"use client"

import { BARE_PAGE_ACTION, BarePage, LineIcon } from "@/components/shell/bare-page"

/**
 * A page whose render failed (the database lost mid-render is the usual cause: proxy.ts answers a 503 page when it
 * is down before the render starts). No details of the error are shown; the server log has them.
 */
export default function PageError({ reset }: { error: Error & { digest?: string }; reset: () => void }) {
  return (
    <BarePage
      title="This page did not load"
      testId="page-error"
      action={
        <button type="button" onClick={() => reset()} className={BARE_PAGE_ACTION}>
          {/* Drawn here rather than taken from the icon set: this boundary's code loads with every page. */}
          <LineIcon>
            <path d="M21 12a9 9 0 1 1-9-9c2.52 0 4.93 1 6.74 2.74L21 8" />
            <path d="M21 3v5h-5" />
          </LineIcon>{" "}
          Try again
        </button>
      }
    >
      Something on our side did not answer. Nothing you saved is lost; try again in a few seconds.
    </BarePage>
  )
}
