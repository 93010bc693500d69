import { z } from "zod"

/** The one UUID check: 8-4-4-4-12 hex digits (any version), the text form PostgreSQL's uuid type takes. */
const UUID_TEXT = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i

export function isUuid(value: string): boolean {
  return UUID_TEXT.test(value)
}

/** The same check for zod schemas (route params, bodies). */
export const uuidSchema = z.string().regex(UUID_TEXT, { error: "must be a UUID" })
