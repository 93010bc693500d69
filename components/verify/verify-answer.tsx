import { CircleCheck, CircleX, History } from "lucide-react"
import type { VerifyAnswer as VerifyAnswerBody } from "@/lib/api/types"

export type VerifyAnswerView = VerifyAnswerBody

/** The answer of a check, in words and an icon; only what the PDF itself prints. */
export function VerifyAnswer({ answer }: { answer: VerifyAnswerView }) {
  const look =
    answer.result === "matches"
      ? {
          Icon: CircleCheck,
          title: `Matches revision ${answer.revision}`,
          className: "border-teal-600 dark:border-teal-400",
        }
      : answer.result === "newer_revision"
        ? {
            Icon: History,
            title: `Revision ${answer.revision}: a newer revision exists`,
            className: "border-signal-600 dark:border-signal-400",
          }
        : { Icon: CircleX, title: "Matches nothing", className: "border-stop-600 dark:border-stop-400" }
  return (
    <section
      role="status"
      aria-live="polite"
      className={`space-y-2 rounded-xl border-2 p-4 ${look.className}`}
      data-testid="verify-answer"
      data-result={answer.result}
    >
      <h2 className="flex items-center gap-2 text-xl font-bold">
        <look.Icon aria-hidden className="size-6 shrink-0" /> {look.title}
      </h2>
      <p>{answer.message}</p>
      {answer.result !== "no_match" ? (
        <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm">
          <dt className="text-graphite-600 dark:text-graphite-300">Shop</dt>
          <dd>{answer.record.shopName}</dd>
          <dt className="text-graphite-600 dark:text-graphite-300">Vehicle</dt>
          <dd>{answer.record.vehicle}</dd>
          <dt className="text-graphite-600 dark:text-graphite-300">Verdict in revision {answer.revision}</dt>
          <dd>{answer.record.verdict}</dd>
          <dt className="text-graphite-600 dark:text-graphite-300">Sealed</dt>
          <dd>{answer.record.sealedAt}</dd>
        </dl>
      ) : null}
    </section>
  )
}
