import type { ColumnType, Generated, Insertable, Selectable, Updateable } from "kysely"

type Timestamp = ColumnType<Date, Date | string, Date | string>
type GeneratedTimestamp = ColumnType<Date, Date | string | undefined, Date | string>
type Json<T> = ColumnType<T, string | T, string | T>

import type { Role } from "@/lib/auth/roles"
import type { JobStatus, ReviewDecision, ReviewStatus } from "@/lib/labels"
import type { RoadTestCheck } from "@/lib/drive-file/road-test"
import type { Profile } from "@/lib/drive-file/schema"
import type { Score, Verdict } from "@/lib/scoring/types"
import type { SetupMeasurement } from "@/lib/setup"

// The vocabulary is declared once in lib/ (roles, labels, scoring) and only re-exported here for the queries.
export type { JobStatus, ReviewDecision, Role, Verdict }
export type DriveStatus = "recording" | "finished"

export interface ShopSettings {
  units?: "imperial" | "metric"
  tirePressureTolerancePsi?: number
  /** IANA zone every time is written in (pages, PDF, e-mail) and road knowledge's hours; default America/Chicago. */
  timeZone?: string
  /** Where the shop is, for the roads map; without it the median start of its drives is used. */
  location?: { lat: number; lon: number } | null
  /** Road knowledge from the shop's own drives; default on. Turning it off removes the model. */
  roadKnowledge?: boolean
  /** Whole months of samples kept before the current month (1-120); null or absent = keep everything. */
  sampleRetentionMonths?: number | null
}

export interface ShopTable {
  id: Generated<string>
  name: string
  settings: Json<ShopSettings>
  created_at: GeneratedTimestamp
}

export interface AppUserTable {
  id: string
  shop_id: string
  email: string
  name: string
  role: Role
  password_hash: string
  disabled: Generated<boolean>
  created_at: GeneratedTimestamp
  /** E-mail me when a drive waits for review (leads; the notice in the app comes regardless). */
  review_mail: Generated<boolean>
}

export interface UserSessionTable {
  id: string
  user_id: string
  expires_at: Timestamp
}

export interface SignInFailureTable {
  id: Generated<string>
  email: string
  client_address: string
  created_at: GeneratedTimestamp
}

export interface ConditionProfileTable {
  id: Generated<string>
  shop_id: string
  key: string
  name: string
  sensor: string | null
  current_version: Generated<number>
  archived: Generated<boolean>
  created_at: GeneratedTimestamp
}

export interface ConditionProfileVersionTable {
  id: Generated<string>
  shop_id: string
  profile_id: string
  version: number
  /** A drive-file profile object as saved; read through resolveProfile (a key added since reads as its default). */
  settings: Json<Profile>
  /** Road-test checks (lib/drive-file/road-test.ts); null = the defaults of the profile's sensor. */
  road_test_checks: Json<RoadTestCheck[]> | null
  created_by: string | null
  created_at: GeneratedTimestamp
}

export interface VehicleTable {
  id: Generated<string>
  shop_id: string
  vin: string
  year: number | null
  make: string | null
  model: string | null
  plate: string | null
  created_at: GeneratedTimestamp
}

export interface JobTable {
  id: Generated<string>
  shop_id: string
  ro_number: string
  customer_name: string
  customer_email: string | null
  customer_phone: string | null
  vehicle_id: string
  status: Generated<JobStatus>
  created_by: string | null
  created_at: GeneratedTimestamp
  updated_at: GeneratedTimestamp
}

export interface JobTaskTable {
  id: Generated<string>
  shop_id: string
  job_id: string
  sensor: string
  method: string
  reason: string
  profile_id: string | null
  created_at: GeneratedTimestamp
}

export interface ChecklistTable {
  task_id: string
  shop_id: string
  data: Json<Record<string, unknown>>
  completed_by: string | null
  completed_at: GeneratedTimestamp
}

export interface AttachmentTable {
  id: Generated<string>
  shop_id: string
  job_id: string
  task_id: string | null
  filename: string
  content_type: string
  size: number
  object_key: string
  thumbnail_key: string | null
  status: Generated<"pending" | "complete">
  uploaded_by: string | null
  created_at: GeneratedTimestamp
  completed_at: Timestamp | null
}

export interface DriveTable {
  /**
   * The internal id: drive_internal_id(shop_id, public_id) (lib/drive-id.ts), unique across the server, the key
   * every child table, lock, notice and cache uses. Never shown: people, the API and files see `public_id`.
   */
  id: string
  /** The drive's id as people, the API, the recorder and files know it; unique within its shop only. */
  public_id: string
  shop_id: string
  job_id: string | null
  task_id: string | null
  vehicle_description: string | null
  profile_version_id: string | null
  /** The resolved condition profile the drive is held to, frozen when the drive starts. */
  profile: Json<Profile>
  driver_id: string
  co_driver_id: string | null
  status: Generated<DriveStatus>
  source: Generated<"recorder" | "import">
  verdict: Verdict | null
  review_status: ReviewStatus | null
  /** Share links are signed with this; withdrawing a drive's links moves it on by one. */
  share_epoch: Generated<number>
  /** learn, road_test or learn_and_road_test (lib/drive-file/road-test.ts). */
  kind: Generated<"learn" | "road_test" | "learn_and_road_test">
  /** The road-test checks the drive is held to, frozen at its start; null for a learn drive. */
  road_test: Json<RoadTestCheck[]> | null
  created_at: GeneratedTimestamp
  finished_at: Timestamp | null
  /** Copied from the drive's score when it is stored (trigger score_to_drive); for the queue and numbers. */
  scored_at: Timestamp | null
  harsh_events: Generated<number>
  cleared_at_seconds: number | null
  duration_seconds: Generated<number>
  qualifying_seconds: Generated<number>
  following_seconds: Generated<number>
  unmet_conditions: Generated<string[]>
  /** A verdict other than met, or any harsh event (a generated column). */
  needs_review: Generated<boolean>
  /** The drive's key in `sample` (an identity): samples carry this instead of the drive's and shop's uuids. */
  sample_key: Generated<number>
}

/**
 * A position sample, partitioned by month on `t` (migration 2026_12_02_1540_partitioned_samples), in the
 * stored units of lib/drive-file/stored.ts. Reach it through the drive (`drive.sample_key`), by drive id
 * and shop: queries/samples.ts.
 */
export interface SampleTable {
  drive_key: number
  t: number
  /** 1e-7 degree */
  lat: number
  /** 1e-7 degree */
  lon: number
  /** mm/s */
  speed: number | null
  /** mm */
  accuracy: number | null
}

/** View `sample_decoded`: samples in the drive file's units with their drive id and shop (for reading by hand and tests). */
export interface SampleDecodedView {
  /** The drive's public id (unique within its shop only: filter by shop_id too). */
  drive_id: string
  shop_id: string
  t: number
  lat: number
  lon: number
  speed: number | null
  accuracy: number | null
}

export interface SampleBatchTable {
  drive_id: string
  batch_id: string
  shop_id: string
  accepted: number
  duplicates: number
  received_at: GeneratedTimestamp
}

export interface MarkTable {
  id: string
  drive_id: string
  shop_id: string
  t: number
  kind: string
  gap_ft: number | null
  text: string | null
  created_by: string | null
  created_at: GeneratedTimestamp
  /** Arrival order, for marks logged at the same millisecond. */
  seq: Generated<number>
  /** Road-test check marks only. */
  check_key: string | null
  result: "pass" | "fail" | "not_equipped" | null
}

export interface ScoreTable {
  drive_id: string
  shop_id: string
  verdict: Verdict
  result: Json<Score>
  scored_at: GeneratedTimestamp
}

export interface ReviewTable {
  id: Generated<string>
  shop_id: string
  drive_id: string
  decision: ReviewDecision
  note: string
  reviewer_id: string | null
  created_at: GeneratedTimestamp
}

export interface NotificationTable {
  id: Generated<string>
  shop_id: string
  user_id: string
  message: string
  link: string | null
  read_at: Timestamp | null
  created_at: GeneratedTimestamp
}

/** The live channel's durable events (db/queries/drive-events.ts). */
export interface DriveEventTable {
  id: Generated<number>
  drive_id: string
  shop_id: string
  kind: string
  body: Json<Record<string, unknown>>
  created_at: GeneratedTimestamp
}

/** The static set-up of one task: measurements typed from the maker's service information. */
export interface SetupRecordTable {
  task_id: string
  shop_id: string
  job_id: string
  measurements: Json<SetupMeasurement[]>
  scan_result: "not_run" | "pass" | "fail"
  scan_notes: Generated<string>
  override_note: string | null
  override_by: string | null
  override_at: Timestamp | null
  updated_by: string | null
  updated_at: GeneratedTimestamp
}

export interface RoadLoopTable {
  id: Generated<string>
  shop_id: string
  number: number
  name: string | null
  cells: string[]
  created_at: GeneratedTimestamp
}

export interface RoadCellStatTable {
  shop_id: string
  cell: string
  /** 0-23 local hour, or -1 for all hours */
  hour: number
  /** 0 = Sunday ... 6, or -1 for all days */
  weekday: number
  seconds: number
  qualifying_seconds: number
  following_seconds: number
  harsh_events: number
  speed_hist: number[]
}

/** A token that changes with every change to the shop's road model (what the Roads page's figures are kept by). */
export interface RoadModelTable {
  shop_id: string
  version: Generated<string>
  updated_at: GeneratedTimestamp
}

export interface RoadDriveTable {
  drive_id: string
  shop_id: string
  profile_id: string | null
  loop_id: string | null
  started_at: Timestamp
  hour: number
  weekday: number
  start_lat: number
  start_lon: number
  driven_seconds: number
  qualifying_seconds: number
  following_seconds: number
  harsh_events: number
  cleared_seconds: number | null
  route: string[]
  track: Json<[number, number][]>
  contribution: Json<unknown>
  updated_at: GeneratedTimestamp
}

export type RevisionCause =
  "finish" | "import" | "late_samples" | "late_marks" | "mark_removed" | "refinish" | "review" | "resealed"

/** One revision of a finished drive's record: the score then, and the digest of drive file + score + review. */
export interface ScoreRevisionTable {
  id: Generated<string>
  shop_id: string
  drive_id: string
  revision: number
  cause: RevisionCause
  verdict: Verdict
  result: Json<Score>
  review_decision: ReviewDecision | null
  /** SHA-256 (hex) of the canonical record (lib/record/seal.ts). */
  digest: string
  /** The short verification code printed on the PDF (from the digest). */
  code: string
  created_by: string | null
  created_at: GeneratedTimestamp
}

/** A PDF the product issued: the SHA-256 of its bytes, so an upload can be matched byte for byte. */
export interface IssuedRecordTable {
  id: Generated<string>
  shop_id: string
  drive_id: string
  revision_id: string
  pdf_sha256: string
  channel: "download" | "email" | "share"
  issued_at: GeneratedTimestamp
}

export interface ShareLinkTable {
  token_sha256: string
  shop_id: string
  drive_id: string
  /** The record's latest revision when the link was made. */
  revision: number
  created_at: GeneratedTimestamp
}

export interface VerifyAttemptTable {
  id: Generated<string>
  client_address: string
  matched: boolean
  created_at: GeneratedTimestamp
}

export interface Database {
  shop: ShopTable
  app_user: AppUserTable
  user_session: UserSessionTable
  sign_in_failure: SignInFailureTable
  condition_profile: ConditionProfileTable
  condition_profile_version: ConditionProfileVersionTable
  vehicle: VehicleTable
  job: JobTable
  job_task: JobTaskTable
  checklist: ChecklistTable
  attachment: AttachmentTable
  drive: DriveTable
  sample: SampleTable
  sample_decoded: SampleDecodedView
  sample_batch: SampleBatchTable
  mark: MarkTable
  score: ScoreTable
  review: ReviewTable
  notification: NotificationTable
  drive_event: DriveEventTable
  setup_record: SetupRecordTable
  road_loop: RoadLoopTable
  road_cell_stat: RoadCellStatTable
  road_drive: RoadDriveTable
  road_model: RoadModelTable
  score_revision: ScoreRevisionTable
  issued_record: IssuedRecordTable
  share_link: ShareLinkTable
  verify_attempt: VerifyAttemptTable
}

export type Shop = Selectable<ShopTable>
export type AppUser = Selectable<AppUserTable>
export type NewAppUser = Insertable<AppUserTable>
export type AppUserUpdate = Updateable<AppUserTable>
export type ConditionProfile = Selectable<ConditionProfileTable>
export type ConditionProfileVersion = Selectable<ConditionProfileVersionTable>
export type Vehicle = Selectable<VehicleTable>
export type Job = Selectable<JobTable>
export type JobTask = Selectable<JobTaskTable>
export type Checklist = Selectable<ChecklistTable>
export type Attachment = Selectable<AttachmentTable>
export type Drive = Selectable<DriveTable>
/** What the access rules read of a drive (app/_server/services/drives.ts accessFacts), with its internal id. */
export type DriveAccess = Pick<Drive, "id" | "shop_id" | "driver_id" | "co_driver_id" | "status" | "review_status">
export type NewDrive = Insertable<DriveTable>
export type SampleRow = Selectable<SampleTable>
export type MarkRow = Selectable<MarkTable>
export type ScoreRow = Selectable<ScoreTable>
export type Review = Selectable<ReviewTable>
export type Notification = Selectable<NotificationTable>
export type ScoreRevision = Selectable<ScoreRevisionTable>
