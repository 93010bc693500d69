export {
  DRIVE_FORMAT,
  DRIVE_FORMAT_2,
  MARK_KINDS,
  MARK_KINDS_2,
  driveFileSchema2,
  markSchema2,
  NOTE_MAX_CHARS,
  apiMarkSchema,
  driveFileSchema,
  markSchema,
  profileSchema,
  sampleSchema,
} from "./schema"
export type { AnyDriveFile, ApiMark, DriveFile, DriveFile2, Mark, Mark2, MarkKind, Profile, Sample } from "./schema"
export * from "./road-test"
export { DEFAULT_PROFILE, resolveProfile } from "./profile"
export type { ResolvedProfile } from "./profile"
export {
  ROOT_PATH,
  formatFieldKey,
  formatIssuePath,
  formatParseError,
  issueMessage,
  parseAnyDriveFile,
  parseDriveFile,
  zodIssuesToFields,
} from "./parse"
export type { ParseAnyDriveFileResult, ParseDriveFileResult } from "./parse"
