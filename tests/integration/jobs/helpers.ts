import { DeleteObjectCommand, HeadObjectCommand, S3Client } from "@aws-sdk/client-s3"
import { beforeAll, expect } from "vitest"
import { testDb } from "../../helpers/db"
import type { ApiClient } from "../../helpers/http"
import { createJob } from "../../helpers/jobs"
import { type ShopTeam, setUpShopTeam } from "../../helpers/team"

/** A fresh shop with its people signed in (setUpShopTeam) and one job its lead made, for the enclosing block. */
export function setUpShopWithJob(label: string) {
  const team = setUpShopTeam(label) as ShopTeam & { job: { id: string; tasks: { id: string }[] } }
  beforeAll(async () => {
    team.job = await createJob(team.lead)
  })
  return team
}

export function testS3() {
  return new S3Client({
    region: process.env.S3_REGION ?? "us-east-1",
    endpoint: process.env.S3_ENDPOINT,
    forcePathStyle: true,
    credentials: {
      accessKeyId: process.env.S3_ACCESS_KEY_ID ?? "S3RVER",
      secretAccessKey: process.env.S3_SECRET_ACCESS_KEY ?? "S3RVER",
    },
  })
}

/** An attachment's row as stored: where its file and thumbnail are kept; undefined once it is removed. */
export function storedAttachment(id: string) {
  return testDb()
    .selectFrom("attachment")
    .select(["object_key", "thumbnail_key", "status"])
    .where("id", "=", id)
    .executeTakeFirst()
}

export async function objectExists(key: string) {
  try {
    await testS3().send(new HeadObjectCommand({ Bucket: process.env.S3_BUCKET ?? "straightaway", Key: key }))
    return true
  } catch (error) {
    if ((error as { $metadata?: { httpStatusCode?: number } }).$metadata?.httpStatusCode === 404) return false
    throw error
  }
}

export async function removeObject(key: string) {
  await testS3().send(new DeleteObjectCommand({ Bucket: process.env.S3_BUCKET ?? "straightaway", Key: key }))
}

/** A 1x1 PNG (a valid file: signature, IHDR, IDAT, IEND, each chunk's CRC right, so it decodes). */
export const TINY_PNG = Buffer.from(
  "89504e470d0a1a0a0000000d49484452000000010000000108060000001f15c489" +
    "0000000d4944415478da6364f8cf500f00038601805a347d6b0000000049454e44ae426082",
  "hex",
)

/** A whole 2x2 baseline JPEG (268 bytes): it starts FF D8 FF for the type check and decodes for the thumbnail. */
export const JPEG_START = Buffer.from(
  "ffd8ffdb004300100b0c0e0c0a100e0d0e1211101318281a181616183123251d283a333d3c3933383740485c4e404457453738506d51575f626768673e4d71797064785c656763" +
    "ffdb0043011112121815182f1a1a2f634238426363636363636363636363636363636363636363636363636363636363636363636363636363636363636363636363636363" +
    "ffc00011080002000203012200021101031101ffc4001500010100000000000000000000000000000003ffc40014100100000000000000000000000000000000" +
    "ffc40014010100000000000000000000000000000005ffc40014110100000000000000000000000000000000ffda000c03010002110311003f00a0018b3fffd9",
  "hex",
)

export async function putToPresignedUrl(url: string, contentType: string, bytes: Uint8Array) {
  const res = await fetch(url, { method: "PUT", headers: { "content-type": contentType }, body: bytes as BodyInit })
  if (!res.ok) throw new Error(`PUT to object store failed: ${res.status} ${await res.text()}`)
}

/** A file to attach to a job (and to one of its tasks when `taskId` is given). */
export type JobFile = {
  jobId: string
  taskId?: string | null
  filename: string
  contentType: string
  bytes: Uint8Array
}

/** Asks for an upload address for `file` (POST /api/uploads, a 201) and answers the attachment id and the address. */
export async function startUpload(client: ApiClient, file: JobFile) {
  const { bytes, ...fields } = file
  const start = await client.post("/api/uploads", { ...fields, size: bytes.byteLength })
  expect(start.status).toBe(201)
  return { id: start.body.attachmentId as string, uploadUrl: start.body.uploadUrl as string }
}

/** POST /api/uploads/:id/complete: the server checks the stored bytes and keeps or removes the file. */
export function completeUpload(client: ApiClient, attachmentId: string) {
  return client.post(`/api/uploads/${attachmentId}/complete`)
}

/** A whole upload as the app makes it: ask for an address, PUT the bytes to the object store, complete. */
export async function uploadFile(client: ApiClient, file: JobFile) {
  const start = await startUpload(client, file)
  await putToPresignedUrl(start.uploadUrl, file.contentType, file.bytes)
  return { ...start, done: await completeUpload(client, start.id) }
}
