import type { z } from "zod"

/** zod issues as `{ "samples.3.lat": "must be ..." }`, the `fields` of the API's error shape. */
export function issuesToFields(issues: readonly z.core.$ZodIssue[]): Record<string, string> {
  const fields: Record<string, string> = {}
  for (const issue of issues) {
    const key = issue.path.map(String).join(".") || "(body)"
    fields[key] ??= issue.message
  }
  return fields
}
