// Issuing the drive record PDF: the record is sealed as a revision first (when it changed since the latest
// one), the PDF names that revision and prints its verification code, and the SHA-256 of the PDF's bytes is
// kept, so /verify can match an uploaded PDF byte for byte.
import "server-only"
import type { Db } from "@/db/client"
import { findDriveForKeyShare, lockDriveRecord } from "@/db/queries/drive-locks"
import { findLatestRevision, findShareLink, insertIssuedRecord } from "@/db/queries/revisions"
import { findScore } from "@/db/queries/scores"
import { env } from "@/lib/env"
import { buildDriveRecordPdf } from "@/lib/record/pdf"
import { sha256Hex } from "@/lib/record/seal"
import { loadRecordData } from "./record-data"
import { sealRevision } from "./revisions"

function verifyUrl() {
  return `${env().APP_URL.replace(/\/$/, "")}/verify`
}

/**
 * The record of a finished drive as a PDF, its revision sealed and its bytes' hash kept. undefined when the
 * drive is not in the shop; `pdf: null` while it has no score (still being recorded).
 * Holds the drive FOR KEY SHARE and its record lock, so late samples or marks wait and the PDF shows exactly
 * the revision it names.
 */
export async function issueRecordPdf(db: Db, driveId: string, shopId: string, channel: "download" | "email" | "share") {
  return db.transaction().execute(async (trx) => {
    const drive = await findDriveForKeyShare(trx, driveId, shopId)
    if (!drive) return undefined
    await lockDriveRecord(trx, drive.id)
    const score = drive.status === "finished" ? await findScore(trx, drive.id, shopId) : undefined
    const sealed = score ? await sealRevision(trx, drive, { cause: "resealed", score }) : undefined
    const loaded = await loadRecordData(trx, drive.id, shopId)
    if (!loaded?.data || !sealed) return loaded ? { head: loaded.head, data: null, pdf: null } : undefined
    const data = {
      ...loaded.data,
      seal: {
        revision: sealed.revision.revision,
        revisedAt: new Date(sealed.revision.created_at).toISOString(),
        code: sealed.revision.code,
        verifyUrl: verifyUrl(),
      },
    }
    const pdf = await buildDriveRecordPdf(data)
    await insertIssuedRecord(trx, {
      shopId,
      driveId: drive.id,
      revisionId: sealed.revision.id,
      pdfSha256: sha256Hex(pdf),
      channel,
    })
    return { head: loaded.head, data, pdf }
  })
}

/** Seals the record as it stands (a drive scored before revisions existed gets its first one); the latest revision. */
export async function sealCurrentRecord(db: Db, driveId: string, shopId: string) {
  return db.transaction().execute(async (trx) => {
    const drive = await findDriveForKeyShare(trx, driveId, shopId)
    if (!drive || drive.status !== "finished") return undefined
    await lockDriveRecord(trx, drive.id)
    const score = await findScore(trx, drive.id, shopId)
    return score ? (await sealRevision(trx, drive, { cause: "resealed", score })).revision : undefined
  })
}

/** For a share link's page: the record's latest revision, and whether it was revised after the link was made. */
export async function shareRevisionState(db: Db, token: string, driveId: string, shopId: string) {
  const [latest, link] = await Promise.all([
    findLatestRevision(db, driveId, shopId),
    findShareLink(db, sha256Hex(token), driveId, shopId),
  ])
  if (!latest) return null
  const revisedAfterLink = link !== undefined && latest.revision > link.revision
  return {
    revision: latest.revision,
    revisedAt: new Date(latest.created_at).toISOString(),
    code: latest.code,
    revisedAfterLink,
    linkMadeAt: link ? new Date(link.created_at).toISOString() : null,
  }
}
