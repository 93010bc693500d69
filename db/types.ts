import type { ColumnType, Generated, Insertable, Selectable, Updateable } from "kysely"

type Timestamp = ColumnType<Date, Date | string, Date | string>
type GeneratedTimestamp = ColumnType<Date, Date | string | undefined, Date | string>
type Json<T> = ColumnType<T, string | T, string | T>

export type Role = "technician" | "co_driver" | "shop_lead" | "admin"
export type JobStatus = "open" | "drive" | "review" | "complete" | "redo"
export type DriveStatus = "recording" | "finished"
export type VerdictValue = "met" | "short" | "not_met" | "unverified"
export type ReviewDecision = "approve" | "redo"

export interface ShopSettings {
  units?: "imperial" | "metric"
  tirePressureTolerancePsi?: number
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
  /** A drive-file profile object (every key of shared/specs/drive-file.md resolved). */
  settings: Json<Record<string, unknown>>
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
  id: string
  shop_id: string
  job_id: string | null
  task_id: string | null
  vehicle_description: string | null
  profile_version_id: string | null
  /** The resolved condition profile the drive is held to, frozen when the drive starts. */
  profile: Json<Record<string, unknown>>
  driver_id: string
  co_driver_id: string | null
  status: Generated<DriveStatus>
  source: Generated<"recorder" | "import">
  verdict: VerdictValue | null
  review_status: "approved" | "redo" | null
  /** Share links are signed with this; withdrawing a drive's links moves it on by one. */
  share_epoch: Generated<number>
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
}

export interface SampleTable {
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
}

export interface ScoreTable {
  drive_id: string
  shop_id: string
  verdict: VerdictValue
  result: Json<Record<string, unknown>>
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
  sample_batch: SampleBatchTable
  mark: MarkTable
  score: ScoreTable
  review: ReviewTable
  notification: NotificationTable
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
export type NewDrive = Insertable<DriveTable>
export type SampleRow = Selectable<SampleTable>
export type MarkRow = Selectable<MarkTable>
export type ScoreRow = Selectable<ScoreTable>
export type Review = Selectable<ReviewTable>
export type Notification = Selectable<NotificationTable>
