import { z } from "zod"
import { clientAddress } from "@/app/_server/client-address"
import { parseJson, route } from "@/app/_server/route"
import { MAX_VERIFY_PDF_BYTES, readBodyBytes, verifyRecord } from "@/app/_server/verify"
import { getDb } from "@/db/client"
import { validationFailed } from "@/lib/errors"
import { normalizeCode } from "@/lib/record/seal"

const codeSchema = z.object({
  code: z.string({ error: "is required" }).max(40, { error: "must be at most 40 characters" }),
})

/**
 * Public (no sign-in): is this a record the product issued? Body: JSON `{code}`, or the PDF itself as
 * `application/pdf`. Throttled per client address like sign-in; bodies are bounded while they are read.
 */
export const POST = route(async (req) => {
  const type = (req.headers.get("content-type") ?? "").split(";")[0]!.trim().toLowerCase()
  const db = getDb()
  if (type === "application/pdf" || type === "application/octet-stream") {
    const pdf = await readBodyBytes(req, MAX_VERIFY_PDF_BYTES)
    if (pdf.byteLength === 0) validationFailed({ file: "is empty" }, "The file is empty; send the record's PDF.")
    if (Buffer.from(pdf.subarray(0, 5)).toString("latin1") !== "%PDF-")
      validationFailed({ file: "is not a PDF" }, "The file is not a PDF; send the record's PDF.")
    return Response.json(await verifyRecord(db, clientAddress(req), { pdf }))
  }
  const { code } = await parseJson(req, codeSchema, { maxBytes: 1024 * 1024 })
  const normal = normalizeCode(code)
  if (!normal) validationFailed({ code: "is not a verification code: 12 letters and digits, like 7KQ2-M9XD-44TB" })
  return Response.json(await verifyRecord(db, clientAddress(req), { code: normal }))
})
