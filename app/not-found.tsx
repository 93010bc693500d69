import { Logo } from "@/components/shell/logo"

/**
 * Every refusal and every address that leads nowhere ends here, with a way back. A plain link, not next/link:
 * this page is part of every page's tree, so its client code would be on every first load (the recorder's too).
 * For the same reason the arrow is drawn here (lucide's arrow-left, whose React component is a client module).
 */
export default function NotFound() {
  return (
    <main className="mx-auto flex min-h-dvh max-w-md flex-col items-start justify-center gap-4 px-4">
      <Logo className="size-10" />
      <h1 className="text-2xl font-bold">Nothing to show here</h1>
      <p>This page does not exist, or it belongs to a drive or job you cannot open.</p>
      <a
        href="/"
        className="inline-flex min-h-12 items-center gap-2 rounded-lg bg-graphite-900 px-4 font-semibold text-white dark:bg-signal-400 dark:text-graphite-950"
        data-testid="way-back"
      >
        <BackArrow /> Back to the start
      </a>
    </main>
  )
}

function BackArrow() {
  return (
    <svg
      viewBox="0 0 24 24"
      fill="none"
      stroke="currentColor"
      strokeWidth={2}
      strokeLinecap="round"
      strokeLinejoin="round"
      aria-hidden
      className="size-5"
    >
      <path d="m12 19-7-7 7-7" />
      <path d="M19 12H5" />
    </svg>
  )
}
