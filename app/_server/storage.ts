import "server-only"
import {
  CopyObjectCommand,
  DeleteObjectCommand,
  GetObjectCommand,
  HeadObjectCommand,
  PutObjectCommand,
  S3Client,
} from "@aws-sdk/client-s3"
import { getSignedUrl } from "@aws-sdk/s3-request-presigner"
import { env } from "@/lib/env"

let client: S3Client | undefined

/** One S3 client per process; path-style so the local fake (s3rver) and hosted stores both work. */
export function getS3(): S3Client {
  const e = env()
  client ??= new S3Client({
    region: e.S3_REGION,
    endpoint: e.S3_ENDPOINT,
    forcePathStyle: true,
    credentials:
      e.S3_ACCESS_KEY_ID && e.S3_SECRET_ACCESS_KEY
        ? { accessKeyId: e.S3_ACCESS_KEY_ID, secretAccessKey: e.S3_SECRET_ACCESS_KEY }
        : undefined,
    // Checksums on presigned PUTs would make browsers send headers they cannot compute.
    requestChecksumCalculation: "WHEN_REQUIRED",
    responseChecksumValidation: "WHEN_REQUIRED",
  })
  return client
}

export function bucket() {
  return env().S3_BUCKET
}

/** Minutes, not hours: a leaked upload address is soon worthless (and after `complete` it writes nowhere served). */
const UPLOAD_URL_SECONDS = 5 * 60

/** A presigned PUT; the uploader must send the same Content-Type. */
export function presignPut(key: string, contentType: string) {
  return getSignedUrl(getS3(), new PutObjectCommand({ Bucket: bucket(), Key: key, ContentType: contentType }), {
    expiresIn: UPLOAD_URL_SECONDS,
  })
}

/**
 * Where an accepted upload lives: a copy made on the server, under a prefix no presigned upload address is ever
 * made for (those are all `shops/...`), so nothing written to an upload address later can change what is served.
 */
export function storedKeyFor(uploadKey: string) {
  return `stored/${uploadKey}`
}

/** A server-side copy (no bytes through the app), with the type given rather than the uploader's. */
export async function copyObject(from: string, to: string, contentType: string) {
  await getS3().send(
    new CopyObjectCommand({
      Bucket: bucket(),
      CopySource: `${bucket()}/${from.split("/").map(encodeURIComponent).join("/")}`,
      Key: to,
      ContentType: contentType,
      MetadataDirective: "REPLACE",
    }),
  )
}

/** An object's bytes as a stream, with its length (downloads go through the app, with the app's headers). */
export async function getObjectStream(key: string): Promise<{ body: ReadableStream; length: number | undefined }> {
  const res = await getS3().send(new GetObjectCommand({ Bucket: bucket(), Key: key }))
  return { body: res.Body!.transformToWebStream(), length: res.ContentLength }
}

/** Size of a stored object, or null when there is none. */
export async function headObjectSize(key: string): Promise<number | null> {
  try {
    const head = await getS3().send(new HeadObjectCommand({ Bucket: bucket(), Key: key }))
    return head.ContentLength ?? 0
  } catch (error) {
    if (isMissing(error)) return null
    throw error
  }
}

/** The first `count` bytes of an object (a ranged GET), or the whole object when it is shorter. */
export async function getObjectPrefix(key: string, count: number): Promise<Uint8Array> {
  const res = await getS3().send(new GetObjectCommand({ Bucket: bucket(), Key: key, Range: `bytes=0-${count - 1}` }))
  const bytes = await res.Body!.transformToByteArray()
  return bytes.subarray(0, count)
}

/** A whole object's bytes (photos for the drive record PDF, for instance). */
export async function getObjectBytes(key: string): Promise<Uint8Array> {
  const res = await getS3().send(new GetObjectCommand({ Bucket: bucket(), Key: key }))
  return res.Body!.transformToByteArray()
}

/** Stores bytes made on the server (thumbnails). */
export async function putObject(key: string, bytes: Uint8Array, contentType: string) {
  await getS3().send(
    new PutObjectCommand({
      Bucket: bucket(),
      Key: key,
      Body: bytes,
      ContentType: contentType,
      ContentLength: bytes.byteLength,
    }),
  )
}

export async function deleteObject(key: string) {
  await getS3().send(new DeleteObjectCommand({ Bucket: bucket(), Key: key }))
}

function isMissing(error: unknown) {
  const e = error as { name?: string; $metadata?: { httpStatusCode?: number } } | null
  return e?.name === "NotFound" || e?.name === "NoSuchKey" || e?.$metadata?.httpStatusCode === 404
}
