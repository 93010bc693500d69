import { DeleteObjectCommand, HeadObjectCommand, S3Client } from "@aws-sdk/client-s3"
import { withCheckDigit } from "@/lib/vin"
import type { ApiClient } from "../../helpers/http"

let counter = 0

/** An invented VIN with a valid check digit; position 7 alphabetic and position 10 "R" make it a 2024. */
export function inventedVin(): string {
  counter += 1
  const serial = String((Date.now() + counter) % 1_000_000).padStart(6, "0")
  return withCheckDigit(`5ZT4KAB3?R1${serial}`)
}

export function newJobBody(overrides: Record<string, unknown> = {}) {
  counter += 1
  return {
    roNumber: `RO-${Date.now()}-${counter}`,
    customer: { name: "Wren Castellano", email: "wren@example.invalid", phone: "555-0100" },
    vehicle: { vin: inventedVin(), make: "Corvane", model: "Tallis", plate: "SAW 204" },
    tasks: [{ sensor: "forward_radar", method: "dynamic", reason: "bumper_or_grille_work" }],
    ...overrides,
  }
}

export async function createJob(client: ApiClient, overrides: Record<string, unknown> = {}) {
  const res = await client.post("/api/jobs", newJobBody(overrides))
  if (res.status !== 201) throw new Error(`job create failed: ${res.status} ${res.text}`)
  return res.body.job
}

export function testS3() {
  return new S3Client({
    region: process.env.S3_REGION ?? "us-east-1",
    endpoint: process.env.S3_ENDPOINT,
    forcePathStyle: true,
    credentials: { accessKeyId: process.env.S3_ACCESS_KEY_ID ?? "S3RVER", secretAccessKey: process.env.S3_SECRET_ACCESS_KEY ?? "S3RVER" },
  })
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

/** A 1x1 PNG (a valid file: signature, IHDR, IDAT, IEND). */
export const TINY_PNG = Buffer.from(
  "89504e470d0a1a0a0000000d4948445200000001000000010806000000" + "1f15c4890000000d49444154789c6360f8cf00000301010018dd8db40000000049454e44ae426082",
  "hex",
)

/** The start of a JPEG (SOI + a JFIF APP0 segment); enough for the type check. */
export const JPEG_START = Buffer.from("ffd8ffe000104a46494600010100000100010000ffd9", "hex")

export async function putToPresignedUrl(url: string, contentType: string, bytes: Uint8Array) {
  const res = await fetch(url, { method: "PUT", headers: { "content-type": contentType }, body: bytes as BodyInit })
  if (!res.ok) throw new Error(`PUT to object store failed: ${res.status} ${await res.text()}`)
}
