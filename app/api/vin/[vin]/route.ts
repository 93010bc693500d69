import { requireRole } from "@/app/_server/auth"
import { route } from "@/app/_server/route"
import { checkVin } from "@/lib/vin"

// Any text is a VIN to check: a malformed one is still a 200 naming its problems (api.md).
export const GET = route<{ vin: string }>(async (_req, { params }) => {
  await requireRole()
  const { vin } = await params
  return Response.json(checkVin(safeDecode(vin).slice(0, 64)))
})

function safeDecode(text: string) {
  try {
    return decodeURIComponent(text)
  } catch {
    return text
  }
}
