import "server-only"
import { formatFieldKey, formatParseError, parseAnyDriveFile, type AnyDriveFile } from "@/lib/drive-file"
import { AppError } from "@/lib/errors"

/** A drive file (version 1 or 2) or a 400 whose message is the CLI's line (`samples[3].lat: must be ...`). */
export function parseDriveFileOrThrow(body: unknown): AnyDriveFile {
  const parsed = parseAnyDriveFile(body)
  if (parsed.ok) return parsed.file
  const key = formatFieldKey(parsed.path.split(/[.[\]]+/).filter(Boolean))
  throw new AppError("validation_failed", formatParseError(parsed), { [key]: parsed.message })
}
