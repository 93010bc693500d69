// Row locks that order a drive's writes (DEVELOPERS.md "Finish and data in flight"): samples and marks hold
// the drive row FOR KEY SHARE while they write, Finish (and a review) holds it FOR UPDATE, so the score Finish
// stores includes every write accepted before it; writes after it see the drive finished and score it again,
// one at a time under the drive's record lock.
// NOTE: FOR KEY SHARE rather than FOR SHARE: it conflicts with FOR UPDATE all the same, but not with the plain
// UPDATE of the verdict a late write makes while another late write holds the row (FOR SHARE would deadlock).
import { sql } from "kysely"
import type { Db } from "../client"
import type { Drive } from "../types"
import { selectInShop } from "./shop-scope"

export type DriveWithSampleSpan = Drive & { first_sample_t: number | null; last_sample_t: number | null }

/** The drive, locked FOR KEY SHARE until the transaction ends; with `sampleSpan`, its first and last sample times too. */
export async function findDriveForKeyShare(
  trx: Db,
  driveId: string,
  shopId: string,
  opts: { sampleSpan?: boolean } = {},
): Promise<DriveWithSampleSpan | undefined> {
  const q = selectInShop(trx, "drive", shopId).selectAll("drive").where("drive.id", "=", driveId)
  const row = opts.sampleSpan
    ? await q
        .select([
          sql<number | null>`(select min(s.t) from sample s where s.drive_key = drive.sample_key)`.as("first_sample_t"),
          sql<number | null>`(select max(s.t) from sample s where s.drive_key = drive.sample_key)`.as("last_sample_t"),
        ])
        .forKeyShare(["drive"])
        .executeTakeFirst()
    : await q.forKeyShare().executeTakeFirst()
  if (!row) return undefined
  return { first_sample_t: null, last_sample_t: null, ...row } as DriveWithSampleSpan
}

/** The drive, locked FOR UPDATE until the transaction ends (Finish, review): waits for the writes that hold it FOR KEY SHARE. */
export async function findDriveForUpdate(trx: Db, driveId: string, shopId: string): Promise<Drive | undefined> {
  return selectInShop(trx, "drive", shopId).selectAll().where("id", "=", driveId).forUpdate().executeTakeFirst()
}

/**
 * The drive's record lock (a transaction-scoped advisory lock): whoever makes a revision of a finished drive
 * holds it, so two late writes holding the row FOR KEY SHARE score one after the other, the later seeing both.
 */
export async function lockDriveRecord(trx: Db, driveId: string): Promise<void> {
  await sql`select pg_advisory_xact_lock(hashtextextended(${`drive-record:${driveId}`}, 0))`.execute(trx)
}
