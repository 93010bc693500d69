// Every check in the drive file's schemas has its own words; the API's words for a wrong or missing value ("must be
// a number", "is required") cover any without, so the CLI and an import say what the API says (zod's global config,
// set once by that module).
import "@/lib/validation/zod-fields"
import { fastParseDriveFile } from "./fast-check"
import {
  DRIVE_FORMAT,
  DRIVE_FORMAT_2,
  driveFileSchema,
  driveFileSchema2,
  type AnyDriveFile,
  type DriveFile,
} from "./schema"

export type ParseAnyDriveFileResult = { ok: true; file: AnyDriveFile } | { ok: false; path: string; message: string }

export type ParseDriveFileResult = { ok: true; file: DriveFile } | { ok: false; path: string; message: string }

/** Path of the whole document, used when the file itself is not an object. */
const ROOT_PATH = "file"

/** ["samples", 3, "lat"] -> "samples[3].lat" */
function formatIssuePath(path: ReadonlyArray<PropertyKey>): string {
  let out = ""
  for (const key of path) {
    if (typeof key === "number") out += `[${key}]`
    else out += out === "" ? String(key) : `.${String(key)}`
  }
  return out === "" ? ROOT_PATH : out
}

/** ["samples", 3, "lat"] -> "samples.3.lat", the key style of the API's `fields`. */
export function formatFieldKey(path: ReadonlyArray<PropertyKey>): string {
  return path.length === 0 ? ROOT_PATH : path.map(String).join(".")
}

/** One line for the CLI and the API: `samples[3].lat: must be between -90 and 90`. */
export function formatParseError(error: { path: string; message: string }): string {
  return `${error.path}: ${error.message}`
}

export function parseDriveFile(input: unknown): ParseDriveFileResult {
  const fast = fastParseDriveFile(input)
  if (fast) return { ok: true, file: fast }
  const result = driveFileSchema.safeParse(input)
  if (result.success) return { ok: true, file: result.data }
  const issue = result.error.issues[0]!
  return { ok: false, path: formatIssuePath(issue.path), message: issue.message }
}

/**
 * A file of either version: `straightaway.drive/2` by its own schema, anything else exactly as
 * parseDriveFile reads version 1 (so a version 1 file is read and refused as it always was), except
 * that an unknown format names both versions.
 */
export function parseAnyDriveFile(input: unknown): ParseAnyDriveFileResult {
  const format = typeof input === "object" && input !== null ? (input as { format?: unknown }).format : undefined
  if (format === DRIVE_FORMAT_2) {
    const result = driveFileSchema2.safeParse(input)
    if (result.success) return { ok: true, file: result.data }
    const issue = result.error.issues[0]!
    return { ok: false, path: formatIssuePath(issue.path), message: issue.message }
  }
  const r = parseDriveFile(input)
  if (!r.ok && r.path === "format" && format !== DRIVE_FORMAT) {
    return { ok: false, path: "format", message: `must be "${DRIVE_FORMAT}" or "${DRIVE_FORMAT_2}"` }
  }
  return r
}
