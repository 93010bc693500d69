import { route } from "@/app/_server/route"
import { AppError } from "@/lib/errors"

// An /api path no handler serves is a 404 in the API's error shape, not the HTML page a browser gets.
const unknown = route<{ path: string[] }>(async () => {
  throw new AppError("not_found", "There is no such API route.")
})

export const GET = unknown
export const POST = unknown
export const PUT = unknown
export const PATCH = unknown
export const DELETE = unknown
