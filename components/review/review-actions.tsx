"use client"

import { Check, Undo2 } from "lucide-react"
import { useRouter } from "next/navigation"
import { useState } from "react"
import { useFormatPrefs } from "@/components/shell/format-prefs"
import { Button } from "@/components/ui/button"
import { ApiError, apiFetch } from "@/lib/api/client"
import { Field, Textarea } from "@/components/ui/field"
import { FormProblem } from "@/components/ui/form"
import { formatLengthRangeFt } from "@/lib/format"

/** Approve or Send back; sending back needs a note saying what to do differently. */
export function ReviewActions({ driveId }: { driveId: string }) {
  const { units } = useFormatPrefs()
  const router = useRouter()
  const [note, setNote] = useState("")
  const [problem, setProblem] = useState<string | null>(null)
  const [noteError, setNoteError] = useState<string | null>(null)
  const [busy, setBusy] = useState(false)

  async function decide(decision: "approve" | "redo") {
    setProblem(null)
    setNoteError(null)
    if (decision === "redo" && !note.trim()) {
      setNoteError("Write a note: what should the technician do differently?")
      return
    }
    setBusy(true)
    try {
      await apiFetch(`/api/drives/${driveId}/review`, { method: "POST", body: { decision, note } })
      router.push("/review")
      router.refresh()
    } catch (error) {
      if (error instanceof ApiError && error.fields?.note) setNoteError(error.fields.note)
      else setProblem(error instanceof Error ? error.message : "That did not work. Try again.")
    } finally {
      setBusy(false)
    }
  }

  return (
    <div className="space-y-3" data-testid="review-actions">
      <Field
        label="Note for the technician"
        htmlFor="review-note"
        error={noteError ?? undefined}
        hint="Needed to send the drive back; optional to approve."
      >
        <Textarea
          id="review-note"
          value={note}
          maxLength={2000}
          onChange={(e) => setNote(e.target.value)}
          placeholder={`e.g. Too little time behind a lead vehicle; follow at ${formatLengthRangeFt(120, 150, units)} on the highway loop.`}
        />
      </Field>
      <FormProblem>{problem}</FormProblem>
      <div className="flex flex-wrap gap-2">
        <Button variant="follow" disabled={busy} onClick={() => decide("approve")}>
          <Check aria-hidden className="size-5" /> Approve
        </Button>
        <Button variant="outline" disabled={busy} onClick={() => decide("redo")}>
          <Undo2 aria-hidden className="size-5" /> Send back
        </Button>
      </div>
    </div>
  )
}
