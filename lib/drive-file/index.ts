export {
  DRIVE_FORMAT,
  MARK_KINDS,
  NOTE_MAX_CHARS,
  apiMarkSchema,
  driveFileSchema,
  markSchema,
  profileSchema,
  sampleSchema,
} from "./schema"
export type { ApiMark, DriveFile, Mark, MarkKind, Profile, Sample } from "./schema"
export { DEFAULT_PROFILE, resolveProfile } from "./profile"
export type { ResolvedProfile } from "./profile"
export {
  ROOT_PATH,
  formatFieldKey,
  formatIssuePath,
  formatParseError,
  issueMessage,
  parseDriveFile,
  zodIssuesToFields,
} from "./parse"
export type { ParseDriveFileResult } from "./parse"
