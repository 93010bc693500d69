import { z } from "zod"

/** What an API field must be, by the type zod expected. */
const EXPECTED: Record<string, string> = {
  string: "text",
  number: "a number",
  int: "a whole number",
  boolean: "true or false",
  object: "an object",
  array: "a list",
  date: "a date",
  bigint: "a whole number",
}

// Every schema without its own words for a wrong type gets these instead of zod's stock sentence ("Invalid input:
// expected string, received undefined"): a schema's own `error` still comes first (zod v4's error precedence).
// A union of plain types (a number, or a form's text) says what each branch takes.
z.config({
  customError: (issue) => {
    if (issue.code !== "invalid_type" && issue.code !== "invalid_union") return undefined
    if (issue.input === undefined) return "is required"
    if (issue.code === "invalid_type") return `must be ${EXPECTED[issue.expected] ?? issue.expected}`
    const takes = issue.errors.map((branch) =>
      branch.length === 1 && branch[0]!.code === "invalid_type" && branch[0]!.path.length === 0
        ? (EXPECTED[branch[0]!.expected] ?? branch[0]!.expected)
        : null,
    )
    return takes.length > 0 && takes.every((t) => t !== null) ? `must be ${takes.join(" or ")}` : undefined
  },
})

/** zod issues as `{ "samples.3.lat": "must be ..." }`, the `fields` of the API's error shape. */
export function issuesToFields(issues: readonly z.core.$ZodIssue[]): Record<string, string> {
  const fields: Record<string, string> = {}
  for (const issue of issues) {
    const key = issue.path.map(String).join(".") || "(body)"
    fields[key] ??= issue.message
  }
  return fields
}
