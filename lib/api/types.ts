// The API's response bodies, declared once: the server's presenters are typed with them (dates as Date), and the
// browser reads them through lib/api/client.ts as `Wire<T>` (dates as the ISO strings JSON makes of them).
import type { Role } from "@/lib/auth/roles"
import type { JobStatus } from "@/lib/labels"

/** What JSON.stringify makes of T on the way to the browser: Dates become ISO strings. */
export type Wire<T> = T extends Date
  ? string
  : T extends (infer U)[]
    ? Wire<U>[]
    : T extends object
      ? { [K in keyof T]: Wire<T[K]> }
      : T

/** GET /api/jobs */
export interface JobListPage {
  jobs: {
    id: string
    roNumber: string
    status: JobStatus
    customer: { name: string }
    vehicle: { vin: string; year: number | null; make: string | null; model: string | null; plate: string | null }
    sensors: string[]
    createdAt: Date
    updatedAt: Date
  }[]
  nextCursor: string | null
  total: number
}

/** GET /api/notifications */
export interface NoticeList {
  notifications: { id: string; message: string; link: string | null; readAt: Date | null; createdAt: Date }[]
  unread: number
}

/** POST and GET /api/session */
export interface SessionBody {
  user: { id: string; email: string; name: string; role: Role; shopId: string }
}

/** POST /api/verify (and the verify page): only what the record's PDF itself prints. */
export type VerifyAnswer =
  | {
      result: "matches" | "newer_revision"
      message: string
      revision: number
      latestRevision: number
      record: { shopName: string; vehicle: string; verdict: string; sealedAt: string }
    }
  | { result: "no_match"; message: string }
