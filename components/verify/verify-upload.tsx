"use client"

import { FileUp } from "lucide-react"
import { useState } from "react"
import { VerifyAnswer, type VerifyAnswerView } from "./verify-answer"

/** Checks a PDF by its bytes: sent as it is to POST /api/verify, nothing kept on this page. */
export function VerifyUpload() {
  const [answer, setAnswer] = useState<VerifyAnswerView | null>(null)
  const [problem, setProblem] = useState<string | null>(null)
  const [busy, setBusy] = useState(false)

  async function check(file: File | undefined) {
    setAnswer(null)
    setProblem(null)
    if (!file) return
    setBusy(true)
    try {
      const res = await fetch("/api/verify", {
        method: "POST",
        headers: { "content-type": "application/pdf" },
        body: file,
      })
      const body = await res.json().catch(() => null)
      if (res.ok) setAnswer(body as VerifyAnswerView)
      else setProblem(body?.error?.message ?? `The check failed (${res.status}). Try again.`)
    } catch {
      setProblem("No connection to the server. Try again when you are online.")
    } finally {
      setBusy(false)
    }
  }

  return (
    <div className="space-y-3">
      <label className="flex min-h-12 cursor-pointer items-center justify-center gap-2 rounded-lg border-2 border-dashed border-graphite-300 px-4 py-3 font-semibold dark:border-graphite-600">
        <FileUp aria-hidden className="size-5" />
        {busy ? "Checking the PDF…" : "Choose the record's PDF"}
        <input
          type="file"
          accept="application/pdf,.pdf"
          className="sr-only"
          data-testid="verify-file"
          onChange={(e) => check(e.target.files?.[0])}
        />
      </label>
      {problem ? (
        <p role="alert" className="font-semibold text-stop-600 dark:text-stop-400">
          {problem}
        </p>
      ) : null}
      {answer ? <VerifyAnswer answer={answer} /> : null}
    </div>
  )
}
