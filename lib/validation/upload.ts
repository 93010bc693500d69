import { z } from "zod"

/** 15 MB: a phone photo at full size or a multi-page diagnostic printout fits. */
export const MAX_UPLOAD_BYTES = 15 * 1024 * 1024

export const ALLOWED_UPLOAD_TYPES = ["image/jpeg", "image/png", "image/webp", "image/heic", "application/pdf"] as const
export type UploadType = (typeof ALLOWED_UPLOAD_TYPES)[number]

export const uploadRequestSchema = z.object({
  jobId: z.uuid("must be a job id"),
  taskId: z.uuid("must be a task id").nullable().optional(),
  filename: z
    .string()
    .trim()
    .min(1, "is required")
    .max(200, "must be at most 200 characters")
    .refine((v) => !/[\u0000-\u001f/\\]/.test(v), "must not contain slashes or control characters"),
  contentType: z.string().trim().toLowerCase().min(1, "is required").max(100),
  size: z.number().int("must be a whole number of bytes").positive("must be more than 0 bytes"),
})

export function isAllowedUploadType(contentType: string): contentType is UploadType {
  return (ALLOWED_UPLOAD_TYPES as readonly string[]).includes(contentType)
}

/** How many leading bytes sniffUploadType needs. */
export const SNIFF_BYTES = 16

const HEIF_BRANDS = ["heic", "heix", "hevc", "hevx", "heim", "heis", "mif1", "msf1"]

/**
 * The allowed type the leading bytes belong to, or null. Signatures: JPEG FF D8 FF; PNG 89 50 4E 47 0D 0A
 * 1A 0A; WebP "RIFF" ???? "WEBP"; PDF "%PDF-"; HEIC an ISO-BMFF "ftyp" box with a HEIF brand (ISO/IEC 23008-12).
 */
export function sniffUploadType(bytes: Uint8Array): UploadType | null {
  const ascii = (from: number, to: number) => String.fromCharCode(...bytes.subarray(from, to))
  if (bytes.length >= 3 && bytes[0] === 0xff && bytes[1] === 0xd8 && bytes[2] === 0xff) return "image/jpeg"
  const png = [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]
  if (bytes.length >= 8 && png.every((b, i) => bytes[i] === b)) return "image/png"
  if (bytes.length >= 12 && ascii(0, 4) === "RIFF" && ascii(8, 12) === "WEBP") return "image/webp"
  if (bytes.length >= 5 && ascii(0, 5) === "%PDF-") return "application/pdf"
  if (bytes.length >= 12 && ascii(4, 8) === "ftyp" && HEIF_BRANDS.includes(ascii(8, 12))) return "image/heic"
  return null
}
