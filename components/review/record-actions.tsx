"use client"

import { zodResolver } from "@hookform/resolvers/zod"
import { Copy, FileText, Link2, Link2Off, Mail } from "lucide-react"
import { useState } from "react"
import { useForm } from "react-hook-form"
import type { z } from "zod"
import { ApiError, apiFetch } from "@/lib/api/client"
import { Button, buttonVariants } from "@/components/ui/button"
import { Field, Input } from "@/components/ui/field"
import { FormDone, FormProblem } from "@/components/ui/form"
import { recordEmailSchema } from "@/lib/validation/review"

type RecordEmail = z.input<typeof recordEmailSchema>

/** E-mails the record (the API seals a PDF issue of it); the address is checked with the API's own schema first. */
function RecordEmailForm({ driveId, customerEmail }: { driveId: string; customerEmail: string | null }) {
  const [sent, setSent] = useState<string | null>(null)
  const form = useForm<RecordEmail>({
    resolver: zodResolver(recordEmailSchema),
    defaultValues: { to: customerEmail ?? "" },
  })
  const { errors, isSubmitting } = form.formState

  async function email({ to }: RecordEmail) {
    setSent(null)
    try {
      await apiFetch(`/api/drives/${driveId}/record/email`, { method: "POST", body: { to } })
      setSent(`Sent to ${to.trim()}.`)
    } catch (error) {
      if (error instanceof ApiError && error.fields?.to) form.setError("to", { message: error.fields.to })
      else form.setError("root", { message: error instanceof Error ? error.message : "Not sent." })
    }
  }

  return (
    <form onSubmit={form.handleSubmit(email)} className="space-y-2" noValidate>
      <Field
        label="E-mail the record to"
        htmlFor="record-to"
        error={errors.to?.message && `Address ${errors.to.message}.`}
      >
        <Input
          id="record-to"
          type="email"
          autoComplete="email"
          defaultValue={customerEmail ?? ""}
          {...form.register("to")}
        />
      </Field>
      <Button type="submit" variant="outline" disabled={isSubmitting}>
        <Mail aria-hidden className="size-5" /> {isSubmitting ? "Sending…" : "E-mail the record"}
      </Button>
      {sent ? <FormDone>{sent}</FormDone> : <FormProblem>{errors.root?.message}</FormProblem>}
    </form>
  )
}

/** Open the record PDF; for leads, e-mail it and make a share link for the customer. */
export function RecordActions({
  driveId,
  canShare,
  customerEmail,
}: {
  driveId: string
  canShare: boolean
  customerEmail: string | null
}) {
  const [share, setShare] = useState<{ url: string; expiresAt: string } | null>(null)
  const [shareProblem, setShareProblem] = useState<string | null>(null)
  const [copied, setCopied] = useState(false)
  const [busy, setBusy] = useState<"link" | "withdraw" | null>(null)
  const [withdrawn, setWithdrawn] = useState(false)

  async function makeLink() {
    setShareProblem(null)
    setCopied(false)
    setBusy("link")
    try {
      setShare(
        await apiFetch<{ url: string; expiresAt: string }>(`/api/drives/${driveId}/share`, {
          method: "POST",
          body: {},
        }),
      )
    } catch (error) {
      setShareProblem(error instanceof Error ? error.message : "No link made.")
    } finally {
      setBusy(null)
    }
  }

  async function withdrawLinks() {
    if (
      !window.confirm(
        "Withdraw every share link made for this drive so far? Anyone who has one will no longer see the record.",
      )
    )
      return
    setShareProblem(null)
    setBusy("withdraw")
    try {
      await apiFetch(`/api/drives/${driveId}/share`, { method: "DELETE" })
      setShare(null)
      setCopied(false)
      setWithdrawn(true)
    } catch (error) {
      setShareProblem(error instanceof Error ? error.message : "The links were not withdrawn.")
    } finally {
      setBusy(null)
    }
  }

  async function copy(url: string) {
    await navigator.clipboard
      ?.writeText(url)
      .then(() => setCopied(true))
      .catch(() => setCopied(false))
  }

  return (
    <div className="space-y-4">
      <a
        className={buttonVariants({ variant: "primary" })}
        href={`/api/drives/${driveId}/record`}
        target="_blank"
        rel="noopener"
        data-testid="open-record"
      >
        <FileText aria-hidden className="size-5" /> Open the drive record (PDF)
      </a>
      {canShare ? (
        <>
          <RecordEmailForm driveId={driveId} customerEmail={customerEmail} />
          <div className="space-y-2">
            <Button variant="outline" onClick={makeLink} disabled={busy !== null}>
              <Link2 aria-hidden className="size-5" />{" "}
              {busy === "link" ? "Making the link…" : share ? "Make a new share link" : "Make a share link"}
            </Button>
            {share ? (
              <div className="space-y-1">
                <div className="flex gap-2">
                  <Input
                    readOnly
                    value={share.url}
                    aria-label="Share link"
                    onFocus={(e) => e.currentTarget.select()}
                    data-testid="share-url"
                  />
                  <Button
                    variant="outline"
                    aria-label="Copy the link"
                    className="min-w-12 shrink-0 px-3"
                    onClick={() => void copy(share.url)}
                  >
                    <Copy aria-hidden className="size-5" />
                  </Button>
                </div>
                <FormDone className="text-sm">{copied ? "Link copied." : null}</FormDone>
                <p className="text-sm text-graphite-600 dark:text-graphite-300">
                  Read-only; works until {share.expiresAt.slice(0, 10)}. Anyone with the link can see the record.
                </p>
              </div>
            ) : null}
            <Button variant="ghost" onClick={withdrawLinks} disabled={busy !== null} data-testid="withdraw-links">
              <Link2Off aria-hidden className="size-5" />{" "}
              {busy === "withdraw" ? "Withdrawing…" : "Withdraw all share links"}
            </Button>
            <FormDone className="text-sm">
              {withdrawn && !share ? "Every earlier link is withdrawn. A new link works again." : null}
            </FormDone>
            <FormProblem>{shareProblem}</FormProblem>
          </div>
        </>
      ) : null}
    </div>
  )
}
