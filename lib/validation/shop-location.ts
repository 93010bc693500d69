import { z } from "zod"

// The shop's place as typed on the settings page: two fields of decimal degrees, both empty for "none"
// (the Roads page then takes the middle of where the shop's drives start).

export type LocationInput =
  { ok: true; location: { lat: number; lon: number } | null } | { ok: false; field: "lat" | "lon"; message: string }

const DECIMAL = /^[+-]?(\d+(\.\d*)?|\.\d+)$/

function degrees(
  text: string,
  max: number,
  field: "lat" | "lon",
): { ok: true; value: number } | { ok: false; field: "lat" | "lon"; message: string } {
  // a decimal comma is common outside the US: 43,8731
  const t = text.trim().replace(/^([+-]?\d+),(\d+)$/, "$1.$2")
  if (!DECIMAL.test(t))
    return {
      ok: false,
      field,
      message: `Write the ${field === "lat" ? "latitude" : "longitude"} in decimal degrees, e.g. ${field === "lat" ? "43.8731" : "-91.9187"}.`,
    }
  const value = Number(t)
  if (!(Math.abs(value) <= max)) return { ok: false, field, message: `must be between -${max} and ${max}` }
  return { ok: true, value }
}

export function parseLocationInput(latText: string, lonText: string): LocationInput {
  if (!latText.trim() && !lonText.trim()) return { ok: true, location: null }
  const lat = degrees(latText, 90, "lat")
  if (!lat.ok) return lat
  const lon = degrees(lonText, 180, "lon")
  if (!lon.ok) return lon
  return { ok: true, location: { lat: lat.value, lon: lon.value } }
}

/** The settings page's location form: the two texts in, the location (or null for none) out. */
export const shopLocationFormSchema = z.object({ lat: z.string(), lon: z.string() }).transform((v, ctx) => {
  const parsed = parseLocationInput(v.lat, v.lon)
  if (parsed.ok) return parsed.location
  ctx.addIssue({ code: "custom", path: [parsed.field], message: parsed.message })
  return z.NEVER
})
