import "server-only"
import { formatFieldKey, formatParseError, parseDriveFile, type DriveFile } from "@/lib/drive-file"
import { AppError } from "@/lib/errors"

/** A drive file or a 400 whose message is the CLI's line (`samples[3].lat: must be ...`). */
export function parseDriveFileOrThrow(body: unknown): DriveFile {
  const parsed = parseDriveFile(body)
  if (parsed.ok) return parsed.file
  const key = formatFieldKey(parsed.path.split(/[.[\]]+/).filter(Boolean))
  throw new AppError("validation_failed", formatParseError(parsed), { [key]: parsed.message })
}
