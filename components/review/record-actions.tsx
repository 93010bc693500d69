"use client"

import { Copy, FileText, Link2, Mail } from "lucide-react"
import { useState } from "react"
import { Button, buttonVariants } from "@/components/ui/button"
import { Field, Input } from "@/components/ui/field"

/** Open the record PDF; for leads, e-mail it and make a share link for the customer. */
export function RecordActions({ driveId, canShare, customerEmail }: { driveId: string; canShare: boolean; customerEmail: string | null }) {
  const [to, setTo] = useState(customerEmail ?? "")
  const [mailState, setMailState] = useState<{ ok: boolean; text: string } | null>(null)
  const [share, setShare] = useState<{ url: string; expiresAt: string } | null>(null)
  const [shareProblem, setShareProblem] = useState<string | null>(null)
  const [busy, setBusy] = useState(false)

  async function email(e: React.FormEvent) {
    e.preventDefault()
    setBusy(true)
    setMailState(null)
    try {
      const res = await fetch(`/api/drives/${driveId}/record/email`, { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify({ to }) })
      const json = await res.json().catch(() => null)
      setMailState(res.ok ? { ok: true, text: `Sent to ${to}.` } : { ok: false, text: json?.error?.fields?.to ? `Address ${json.error.fields.to}.` : (json?.error?.message ?? "Not sent.") })
    } catch {
      setMailState({ ok: false, text: "No connection; not sent." })
    } finally {
      setBusy(false)
    }
  }

  async function makeLink() {
    setShareProblem(null)
    const res = await fetch(`/api/drives/${driveId}/share`, { method: "POST", headers: { "content-type": "application/json" }, body: "{}" })
    const json = await res.json().catch(() => null)
    if (res.ok) setShare({ url: json.url, expiresAt: json.expiresAt })
    else setShareProblem(json?.error?.message ?? "No link made.")
  }

  return (
    <div className="space-y-4">
      <a className={buttonVariants({ variant: "primary" })} href={`/api/drives/${driveId}/record`} target="_blank" rel="noopener" data-testid="open-record">
        <FileText aria-hidden className="size-5" /> Open the drive record (PDF)
      </a>
      {canShare ? (
        <>
          <form onSubmit={email} className="space-y-2">
            <Field label="E-mail the record to" htmlFor="record-to">
              <Input id="record-to" type="email" required value={to} onChange={(e) => setTo(e.target.value)} autoComplete="email" />
            </Field>
            <Button type="submit" variant="outline" disabled={busy || !to}>
              <Mail aria-hidden className="size-5" /> Send
            </Button>
            {mailState ? (
              <p role="status" className={mailState.ok ? "text-teal-700 dark:text-teal-300" : "text-stop-600 dark:text-stop-400"}>
                {mailState.text}
              </p>
            ) : null}
          </form>
          <div className="space-y-2">
            <Button variant="outline" onClick={makeLink}>
              <Link2 aria-hidden className="size-5" /> Make a share link
            </Button>
            {share ? (
              <div className="space-y-1">
                <div className="flex gap-2">
                  <Input readOnly value={share.url} aria-label="Share link" onFocus={(e) => e.currentTarget.select()} />
                  <Button variant="ghost" aria-label="Copy the link" onClick={() => navigator.clipboard?.writeText(share.url)}>
                    <Copy aria-hidden className="size-5" />
                  </Button>
                </div>
                <p className="text-sm text-graphite-600 dark:text-graphite-300">Read-only; works until {share.expiresAt.slice(0, 10)}. Anyone with it can see the record.</p>
              </div>
            ) : null}
            {shareProblem ? <p role="alert" className="text-stop-600 dark:text-stop-400">{shareProblem}</p> : null}
          </div>
        </>
      ) : null}
    </div>
  )
}
