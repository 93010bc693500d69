import type { ReactNode } from "react"
import { Logo } from "./logo"

/** The one way on from a bare page: a button or a plain link, both drawn alike. */
export const BARE_PAGE_ACTION =
  "inline-flex min-h-12 items-center gap-2 rounded-lg bg-graphite-900 px-4 font-semibold text-white dark:bg-signal-400 dark:text-graphite-950"

/**
 * A page with no shell around it (a failed render, an address that leads nowhere): the logo, a heading, a sentence
 * and one way on. Kept free of client code, as it is part of every page's tree.
 */
export function BarePage({
  title,
  children,
  action,
  testId,
}: {
  title: string
  children: ReactNode
  action: ReactNode
  testId?: string
}) {
  return (
    <main
      className="mx-auto flex min-h-dvh max-w-md flex-col items-start justify-center gap-4 px-4"
      data-testid={testId}
    >
      <Logo className="size-10" />
      <h1 className="text-2xl font-bold">{title}</h1>
      <p>{children}</p>
      {action}
    </main>
  )
}

/** A 24-unit line icon drawn in place (lucide's geometry), where the icon set's client module would load on every page. */
export function LineIcon({ children }: { children: ReactNode }) {
  return (
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
      {children}
    </svg>
  )
}
