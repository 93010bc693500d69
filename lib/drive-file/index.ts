export {
  
  
  MARK_KINDS,
  
  
  
  
  apiMarkSchema,
  driveFileSchema,
  markSchema,
  profileSchema,
  sampleSchema,
} from "./schema"
export type { AnyDriveFile, ApiMark, DriveFile, DriveFile2, Mark, Mark2,  Profile, Sample } from "./schema"
export * from "./road-test"
export { DEFAULT_PROFILE, resolveProfile } from "./profile"
export type { ResolvedProfile } from "./profile"
export {
  
  formatFieldKey,
  
  formatParseError,
  
  parseAnyDriveFile,
  parseDriveFile,
  zodIssuesToFields,
} from "./parse"

