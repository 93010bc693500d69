import { z } from "zod"
import { requireRole } from "@/app/_server/auth"
import { sendMail } from "@/app/_server/mail"
import { recordFilename } from "@/app/_server/record-data"
import { issueRecordPdf } from "@/app/_server/record-seal"
import { parseJson, parseParams, route, uuidParam } from "@/app/_server/route"
import { getDb } from "@/db/client"
import { AppError } from "@/lib/errors"
import { describeVehicle, roLabel, RECORD_CAUTIONS, VERDICT_WORD } from "@/lib/record"
import { recordEmailSchema } from "@/lib/validation/review"
import { loadDriveFor } from "../../../_service"

const params = z.object({ driveId: uuidParam })

export const POST = route<{ driveId: string }>(async (req, ctx) => {
  const { user } = await requireRole("shop_lead")
  const { driveId } = await parseParams(ctx.params, params)
  const { to } = await parseJson(req, recordEmailSchema)
  const db = getDb()
  await loadDriveFor(db, driveId, user, "see")
  const loaded = await issueRecordPdf(db, driveId, user.shopId, "email")
  if (!loaded?.pdf) throw new AppError("conflict", "The record is made once the drive is finished and scored.")
  const { head, data, pdf } = loaded
  const vehicle = describeVehicle(data.vehicle, data.vehicleDescription)
  await sendMail({
    to,
    subject: `Drive record: ${vehicle}${head.ro_number ? `, ${roLabel(head.ro_number)}` : ""}`,
    text: [
      `Attached is the record of the calibration drive for ${vehicle}${data.vehicle ? ` (VIN ${data.vehicle.vin})` : ""}.`,
      `Verdict: ${VERDICT_WORD[data.score.verdict]}.`,
      `Revision ${data.seal.revision} of the record; verification code ${data.seal.code} (check it at ${data.seal.verifyUrl}).`,
      "",
      ...RECORD_CAUTIONS,
      "",
      `${data.shopName}`,
    ].join("\n"),
    attachments: [{ filename: recordFilename(head), contentType: "application/pdf", content: pdf }],
  })
  return Response.json({ sent: true, to }, { status: 202 })
})
