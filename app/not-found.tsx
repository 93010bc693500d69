import { ArrowLeft } from "lucide-react"
import Link from "next/link"
import { Logo } from "@/components/shell/logo"

/** Every refusal and every address that leads nowhere ends here, with a way back. */
export default function NotFound() {
  return (
    <main className="mx-auto flex min-h-dvh max-w-md flex-col items-start justify-center gap-4 px-4">
      <Logo className="size-10" />
      <h1 className="text-2xl font-bold">Nothing to show here</h1>
      <p>This page does not exist, or it belongs to a drive or job you cannot open.</p>
      <Link href="/" className="inline-flex min-h-12 items-center gap-2 rounded-lg bg-graphite-900 px-4 font-semibold text-white dark:bg-signal-400 dark:text-graphite-950" data-testid="way-back">
        <ArrowLeft aria-hidden className="size-5" /> Back to the start
      </Link>
    </main>
  )
}
