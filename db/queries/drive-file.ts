import { DRIVE_FORMAT, type DriveFile, type Profile } from "@/lib/drive-file/schema"
import { notFound } from "@/lib/errors"
import type { Db } from "../client"
import { findDriveInShop } from "./drives"
import { listMarks } from "./marks"
import { listSamples } from "./samples"

/**
 * The drive as a `straightaway.drive/1` file: its frozen profile, samples by time, marks by time then
 * arrival. Scoring, exports and the drive record all start here, so they all see the same data.
 * Another shop's drive (or none) is a not_found AppError.
 */
export async function loadDriveFile(db: Db, driveId: string, shopId: string): Promise<DriveFile> {
  const drive = await findDriveInShop(db, driveId, shopId)
  if (!drive) notFound("That drive")
  const [samples, marks] = await Promise.all([listSamples(db, driveId, shopId), listMarks(db, driveId, shopId)])
  return {
    format: DRIVE_FORMAT,
    profile: drive.profile as Profile,
    samples,
    marks: marks.map(({ id: _id, ...m }) => m),
  }
}
