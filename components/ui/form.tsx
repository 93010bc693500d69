import { CircleAlert, CircleCheck } from "lucide-react"
import type { ReactNode } from "react"
import type { FieldPath, FieldValues, UseFormReturn } from "react-hook-form"
import { ApiError } from "@/lib/api/client"
import { cn } from "./cn"

/**
 * After a refused save: the API's field problems (`error.fields`, dotted paths such as `tasks.0.sensor`) go on the
 * form's fields, and the sentence for the whole form is returned (the API's message, else `fallback`).
 */
export function showApiProblem<T extends FieldValues>(
  form: Pick<UseFormReturn<T>, "setError">,
  error: unknown,
  fallback: string,
): string {
  if (error instanceof ApiError && error.fields)
    for (const [path, message] of Object.entries(error.fields)) form.setError(path as FieldPath<T>, { message })
  return error instanceof Error ? error.message : fallback
}

/** A line after a save: an icon and the words, announced to screen readers by `role`; nothing when empty. */
function saveLine(role: "alert" | "status", look: string, icon: ReactNode) {
  return function SaveLine({ children, className }: { children: ReactNode; className?: string }) {
    if (!children) return null
    return (
      <p role={role} className={cn(look, className)}>
        {icon}
        <span>{children}</span>
      </p>
    )
  }
}

/** A form's problem after a save: word, icon and colour, announced to screen readers. */
export const FormProblem = saveLine(
  "alert",
  "flex items-start gap-2 font-medium text-stop-600 dark:text-stop-400",
  <CircleAlert aria-hidden className="mt-0.5 size-5 shrink-0" />,
)

/** A quiet "done" line after a save. */
export const FormDone = saveLine(
  "status",
  "flex items-center gap-1.5 font-medium",
  <CircleCheck aria-hidden className="size-5 shrink-0 text-teal-600 dark:text-teal-300" />,
)

/** `<option>`s for a list of codes and their words. */
export function Options<T extends string>({ values, labels }: { values: readonly T[]; labels: Record<T, string> }) {
  return values.map((v) => (
    <option key={v} value={v}>
      {labels[v]}
    </option>
  ))
}

/** The message react-hook-form holds at a dotted path (`tasks.0.sensor`). */
export function errorAt(errors: unknown, path: string): string | undefined {
  let node: unknown = errors
  for (const p of path.split(".")) node = (node as Record<string, unknown> | undefined)?.[p]
  return (node as { message?: string } | undefined)?.message
}
