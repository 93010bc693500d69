import { redirect } from "next/navigation"

/** Old-style link to a drive being recorded: the recorder keeps its drive in `?drive=`. */
export default async function RecordDrivePage({ params }: { params: Promise<{ driveId: string }> }) {
  const { driveId } = await params
  redirect(`/record?drive=${encodeURIComponent(driveId)}`)
}
