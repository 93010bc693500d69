"use client"
import { useRouter } from "next/navigation"
import { useState } from "react"
import { apiFetch } from "@/lib/api/client"
import { Button } from "@/components/ui/button"

/** Admin only: turn road knowledge off (the model is removed) or on again. */
export function RoadKnowledgeSwitch({ enabled }: { enabled: boolean }) {
  const router = useRouter()
  const [busy, setBusy] = useState(false)
  const [error, setError] = useState<string | null>(null)
  async function set(next: boolean) {
    if (
      !next &&
      !window.confirm("Turn road knowledge off? The shop's road model is removed now; drives and scores stay.")
    )
      return
    setBusy(true)
    setError(null)
    try {
      await apiFetch("/api/shop/settings", { method: "PATCH", body: { roadKnowledge: next } })
      router.refresh()
    } catch (e) {
      setError((e as Error).message)
    } finally {
      setBusy(false)
    }
  }
  return (
    <div className="space-y-2">
      <Button
        variant={enabled ? "outline" : "primary"}
        size="sm"
        disabled={busy}
        onClick={() => set(!enabled)}
        data-testid="road-knowledge-switch"
      >
        {enabled ? "Turn road knowledge off and remove the model" : "Turn road knowledge on"}
      </Button>
      {error ? (
        <p role="alert" className="text-sm text-stop-600 dark:text-stop-400">
          {error}
        </p>
      ) : null}
    </div>
  )
}
