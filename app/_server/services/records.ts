import "server-only"
// The drive record's workflows that combine the record, the seal and mail.
import { sendMail } from "@/app/_server/mail"
import { recordFilename } from "@/app/_server/record-data"
import { issueRecordPdf } from "@/app/_server/record-seal"
import type { Db } from "@/db/client"
import { AppError } from "@/lib/errors"
import { describeVehicle, RECORD_CAUTIONS, roLabel, VERDICT_WORD } from "@/lib/record"

/** E-mails the drive's record (a sealed PDF issue of its latest revision) to `to`. The caller checked access. */
export async function emailRecord(db: Db, driveId: string, shopId: string, to: string): Promise<void> {
  const loaded = await issueRecordPdf(db, driveId, shopId, "email")
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
}
