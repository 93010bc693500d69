import {
  DRIVE_FORMAT,
  DRIVE_FORMAT_2,
  type AnyDriveFile,
  type DriveFile,
  type Mark,
  type Sample,
} from "@/lib/drive-file/schema"
import { notFound } from "@/lib/errors"
import type { Db } from "../client"
import { findDriveInShop } from "./drives"
import type { Drive } from "../types"
import { listMarks } from "./marks"
import { listSamples } from "./samples"

/**
 * The drive as a `straightaway.drive/1` file (version 2 for a road test or when it holds check marks): its frozen profile, samples by time, marks by time then
 * arrival. Scoring, exports and the drive record all start here, so they all see the same data.
 * Another shop's drive (or none) is a not_found AppError.
 */
export async function loadDriveFile(db: Db, driveId: string, shopId: string): Promise<AnyDriveFile> {
  const drive = await findDriveInShop(db, driveId, shopId)
  if (!drive) notFound("That drive")
  const [samples, marks] = await Promise.all([listSamples(db, driveId, shopId), listMarks(db, driveId, shopId)])
  return driveFileOf(drive, samples, marks)
}

/** The file from the drive row, its samples by time and its marks (listMarks); the one place its shape is made. */
export function driveFileOf(
  drive: Drive,
  samples: Sample[],
  marks: Awaited<ReturnType<typeof listMarks>>,
): AnyDriveFile {
  const fileMarks = marks.map(({ id: _id, ...m }) => m)
  // A learn drive with no check marks stays a version 1 file, exactly as before road tests existed.
  if (drive.kind === "learn" && !fileMarks.some((m) => m.kind === "check")) {
    const v1: DriveFile = {
      format: DRIVE_FORMAT,
      profile: drive.profile,
      samples,
      marks: fileMarks as Mark[],
    }
    return v1
  }
  return {
    format: DRIVE_FORMAT_2,
    kind: drive.kind,
    profile: drive.profile,
    ...(drive.road_test ? { roadTest: { checks: drive.road_test } } : {}),
    samples,
    marks: fileMarks,
  }
}
