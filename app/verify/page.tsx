import { ShieldCheck } from "lucide-react"
import type { Metadata } from "next"
import { headers } from "next/headers"
import { clientAddress } from "@/app/_server/client-address"
import { verifyRecord } from "@/app/_server/verify"
import { Logo } from "@/components/shell/logo"
import { buttonVariants } from "@/components/ui/button"
import { Card } from "@/components/ui/card"
import { VerifyAnswer, type VerifyAnswerView } from "@/components/verify/verify-answer"
import { VerifyUpload } from "@/components/verify/verify-upload"
import { getDb } from "@/db/client"
import { AppError } from "@/lib/errors"
import { normalizeCode } from "@/lib/record/seal"

export const dynamic = "force-dynamic"
export const metadata: Metadata = {
  title: "Check a drive record",
  robots: { index: false, follow: false },
  referrer: "no-referrer",
}

/** Public: no sign-in. A code in the address (the PDF's QR code opens it so) is checked on the server. */
export default async function VerifyPage({
  searchParams,
}: {
  searchParams: Promise<Record<string, string | string[] | undefined>>
}) {
  const raw = (await searchParams).code
  const typed = typeof raw === "string" ? raw.slice(0, 40) : ""
  let answer: VerifyAnswerView | null = null
  let problem: string | null = null
  if (typed) {
    const code = normalizeCode(typed)
    if (!code) problem = "That is not a verification code. It has 12 letters and digits, like 7KQ2-M9XD-44TB."
    else {
      try {
        answer = await verifyRecord(
          getDb(),
          clientAddress(new Request("http://verify.invalid/", { headers: await headers() })),
          { code },
        )
      } catch (error) {
        if (!(error instanceof AppError)) throw error
        problem = error.message
      }
    }
  }
  return (
    <main className="mx-auto max-w-xl space-y-5 px-4 py-8">
      <header className="flex items-center gap-3">
        <Logo className="size-10" />
        <div>
          <h1 className="flex items-center gap-2 text-2xl font-bold tracking-tight">
            <ShieldCheck aria-hidden className="size-6" /> Check a drive record
          </h1>
          <p className="text-graphite-600 dark:text-graphite-300">
            Is this the record the shop issued, and is it the latest revision?
          </p>
        </div>
      </header>
      <Card className="space-y-3">
        <h2 className="text-lg font-semibold">By its verification code</h2>
        <form method="get" action="/verify" className="flex flex-wrap gap-2">
          <label htmlFor="code" className="sr-only">
            Verification code
          </label>
          <input
            id="code"
            name="code"
            defaultValue={typed}
            placeholder="7KQ2-M9XD-44TB"
            autoComplete="off"
            autoCapitalize="characters"
            spellCheck={false}
            maxLength={40}
            className="min-h-12 min-w-0 flex-1 rounded-lg border-2 border-graphite-300 bg-white px-3 font-mono text-lg tracking-wider dark:border-graphite-600 dark:bg-asphalt-800"
            data-testid="verify-code"
          />
          <button type="submit" className={buttonVariants({ variant: "primary" })}>
            Check
          </button>
        </form>
        <p className="text-sm text-graphite-600 dark:text-graphite-300">
          The code is printed on the record beside its square QR code.
        </p>
        {problem ? (
          <p role="alert" className="font-semibold text-stop-600 dark:text-stop-400" data-testid="verify-problem">
            {problem}
          </p>
        ) : null}
        {answer ? <VerifyAnswer answer={answer} /> : null}
      </Card>
      <Card className="space-y-3">
        <h2 className="text-lg font-semibold">By the PDF itself</h2>
        <p className="text-sm text-graphite-600 dark:text-graphite-300">
          The file is compared byte for byte with the records issued. A PDF changed in any way matches nothing.
        </p>
        <VerifyUpload />
      </Card>
      <p className="text-sm text-graphite-600 dark:text-graphite-300">
        A record shows how the calibration drive went. Whether the calibration is done is what the vehicle itself
        reports, following the maker&apos;s procedure.
      </p>
    </main>
  )
}
