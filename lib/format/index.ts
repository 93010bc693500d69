import { mToFt, mToMi, mpsToKmh, mpsToMph, mphToMps, ftToM, STANDARD_GRAVITY_MPS2 } from "@/lib/units"

// The one way every page, the PDF, the e-mail and the CSV write times, durations and units.
// No react, next or db imports: the recorder bundle and the PDF builder use it too.

export type UnitSystem = "imperial" | "metric"

/** A shop without a time zone of its own reads times in US Central time (product default, said on the settings page). */
export const DEFAULT_TIME_ZONE = "America/Chicago"

export interface FormatPrefs {
  units: UnitSystem
  timeZone: string
}

export const DEFAULT_PREFS: Readonly<FormatPrefs> = Object.freeze({ units: "imperial", timeZone: DEFAULT_TIME_ZONE })

// ---- durations ----------------------------------------------------------------------------------

function hoursMinutesSeconds(total: number): [number, number, number] {
  return [Math.floor(total / 3600), Math.floor((total % 3600) / 60), total % 60]
}

/**
 * One style and one rounding for every duration: whole seconds, always rounded down (a shortfall of
 * 9 min 59.6 s never reads as 10 min), parts that are zero left out: "48 s", "11 min 48 s", "10 min", "1 h 2 min 5 s".
 */
export function formatDuration(seconds: number | null | undefined): string {
  const total = wholeSeconds(seconds)
  if (total === null) return "—"
  const [h, m, s] = hoursMinutesSeconds(total)
  const parts = [h ? `${h} h` : "", m ? `${m} min` : "", s ? `${s} s` : ""].filter(Boolean)
  return parts.length ? parts.join(" ") : "0 s"
}

/**
 * A running clock for the recorder's meters: minutes and seconds, "7:05", and hours once past one, "1:02:05"; whole
 * seconds rounded down as formatDuration rounds them, so a clock never shows a second not yet driven.
 */
export function formatClock(seconds: number | null | undefined): string {
  const total = wholeSeconds(seconds)
  if (total === null) return "—"
  const [h, m, s] = hoursMinutesSeconds(total)
  const two = (n: number) => String(n).padStart(2, "0")
  return h ? `${h}:${two(m)}:${two(s)}` : `${m}:${two(s)}`
}

/** A requirement or limit given in whole minutes in a profile: the same style as formatDuration. */
export function formatMinutesSetting(minutes: number): string {
  return formatDuration(minutes * 60)
}

// ---- dates and times ----------------------------------------------------------------------------

export function isTimeZone(zone: string): boolean {
  if (!zone || zone.length > 64) return false
  try {
    new Intl.DateTimeFormat("en-US", { timeZone: zone })
    return true
  } catch {
    return false
  }
}

function zoneOrDefault(zone: string | null | undefined): string {
  return zone && isTimeZone(zone) ? zone : DEFAULT_TIME_ZONE
}

type Moment = string | number | Date

function toDate(at: Moment): Date {
  return at instanceof Date ? at : new Date(at)
}

const DATE_TIME: Intl.DateTimeFormatOptions = {
  month: "short",
  day: "numeric",
  year: "numeric",
  hour: "numeric",
  minute: "2-digit",
}

/** A moment in the shop's zone (the default zone when none or an unknown one), "—" for an invalid moment. */
function formatMoment(at: Moment, timeZone: string | null | undefined, options: Intl.DateTimeFormatOptions): string {
  const d = toDate(at)
  if (Number.isNaN(d.getTime())) return "—"
  return new Intl.DateTimeFormat("en-US", { ...options, timeZone: zoneOrDefault(timeZone) }).format(d)
}

/** "Dec 2, 2026, 9:42 AM", with the zone's short name after it when `zoneName` ("… 9:42 AM CST"). */
export function formatDateTime(at: Moment, timeZone?: string | null, opts: { zoneName?: boolean } = {}): string {
  return formatMoment(at, timeZone, { ...DATE_TIME, ...(opts.zoneName ? { timeZoneName: "short" } : {}) })
}

/** "Dec 2, 2026" */
export function formatDate(at: Moment, timeZone?: string | null): string {
  return formatMoment(at, timeZone, { month: "short", day: "numeric", year: "numeric" })
}

/** "Dec 2": a day on a chart axis, where the year is plain from the range. */
export function formatDay(at: Moment, timeZone?: string | null): string {
  return formatMoment(at, timeZone, { month: "short", day: "numeric" })
}

/** "9:42 AM" */
export function formatTime(at: Moment, timeZone?: string | null): string {
  return formatMoment(at, timeZone, { hour: "numeric", minute: "2-digit" })
}

/** "9:42:19 AM": formatTime to the second, for what happened moments ago (the recorder's last sync). */
export function formatTimeWithSeconds(at: Moment, timeZone?: string | null): string {
  return formatMoment(at, timeZone, { hour: "numeric", minute: "2-digit", second: "2-digit" })
}

/** An hour of the shop's day (0-23), in formatTime's style: 9 -> "9:00 AM", 0 -> "12:00 AM". */
export function formatHour(hour: number): string {
  return new Intl.DateTimeFormat("en-US", { hour: "numeric", minute: "2-digit", timeZone: "UTC" }).format(
    Date.UTC(2000, 0, 1, ((hour % 24) + 24) % 24),
  )
}

/** The calendar day in the zone as YYYY-MM-DD (file names, grouping by day). */
export function isoDay(at: Moment, timeZone?: string | null): string {
  const parts = new Intl.DateTimeFormat("en-CA", {
    year: "numeric",
    month: "2-digit",
    day: "2-digit",
    timeZone: zoneOrDefault(timeZone),
  }).formatToParts(toDate(at))
  const get = (t: string) => parts.find((p) => p.type === t)?.value ?? ""
  return `${get("year")}-${get("month")}-${get("day")}`
}

/** Whole seconds, rounded down with float dust kept out: what formatDuration and formatClock show, and a machine-readable column (CSV, JSON) holds. */
export function wholeSeconds(seconds: number): number
export function wholeSeconds(seconds: number | null | undefined): number | null
export function wholeSeconds(seconds: number | null | undefined): number | null {
  if (seconds == null || !Number.isFinite(seconds)) return null
  // The epsilon keeps 0.1 + 0.2 style float dust from losing a whole second (708.0000001 and 707.9999999 both read 11 min 48 s).
  return Math.max(0, Math.floor(seconds + 1e-6))
}

/**
 * The instant as ISO 8601 local time in the zone with its UTC offset, to the second: "2026-12-02T09:44:19-06:00".
 * For a machine-readable column that still reads in the shop's time (the offset makes it unambiguous).
 */
export function isoLocalDateTime(at: Moment, timeZone?: string | null): string {
  const d = toDate(at)
  if (Number.isNaN(d.getTime())) return ""
  const parts = new Intl.DateTimeFormat("en-CA", {
    year: "numeric",
    month: "2-digit",
    day: "2-digit",
    hour: "2-digit",
    minute: "2-digit",
    second: "2-digit",
    hourCycle: "h23",
    timeZone: zoneOrDefault(timeZone),
  }).formatToParts(d)
  const get = (t: string) => Number(parts.find((p) => p.type === t)?.value ?? 0)
  const wallMs = Date.UTC(get("year"), get("month") - 1, get("day"), get("hour"), get("minute"), get("second"))
  const offsetMin = Math.round((wallMs - Math.floor(d.getTime() / 1000) * 1000) / 60_000)
  const pad = (n: number, w = 2) => String(n).padStart(w, "0")
  const sign = offsetMin < 0 ? "-" : "+"
  const abs = Math.abs(offsetMin)
  return `${pad(get("year"), 4)}-${pad(get("month"))}-${pad(get("day"))}T${pad(get("hour"))}:${pad(get("minute"))}:${pad(get("second"))}${sign}${pad(Math.floor(abs / 60))}:${pad(abs % 60)}`
}

/** "America/Chicago (CST)": the zone as the PDF names it; the short name is the one in force at `at`. */
export function describeTimeZone(timeZone?: string | null, at: Moment = Date.now()): string {
  const zone = zoneOrDefault(timeZone)
  const short = new Intl.DateTimeFormat("en-US", { timeZone: zone, timeZoneName: "short" })
    .formatToParts(toDate(at))
    .find((p) => p.type === "timeZoneName")?.value
  return short && short !== zone ? `${zone} (${short})` : zone
}

// ---- units --------------------------------------------------------------------------------------

export function speedUnit(units: UnitSystem): "mph" | "km/h" {
  return units === "metric" ? "km/h" : "mph"
}

function lengthUnit(units: UnitSystem): "ft" | "m" {
  return units === "metric" ? "m" : "ft"
}

function distanceUnit(units: UnitSystem): "mi" | "km" {
  return units === "metric" ? "km" : "mi"
}

/** Up to `digits` decimals, trailing zeros dropped: 35 -> "35", 56.327 -> "56.3". */
function round(x: number, digits: number): string {
  const f = 10 ** digits
  const r = Math.round(x * f) / f
  return String(Object.is(r, -0) ? 0 : r)
}

/** A speed in the shop's unit, whole numbers ("35 mph", "56 km/h"). */
export function formatSpeed(mps: number | null | undefined, units: UnitSystem, digits = 0): string {
  if (mps == null || !Number.isFinite(mps)) return "—"
  const v = units === "metric" ? mpsToKmh(mps) : mpsToMph(mps)
  return `${round(v, digits)} ${speedUnit(units)}`
}

/** Profiles keep speeds in mph (drive-file format); shown in the shop's unit. */
export function formatSpeedMph(mph: number | null | undefined, units: UnitSystem, digits = 0): string {
  if (mph == null) return "—"
  return units === "metric" ? formatSpeed(mphToMps(mph), units, digits) : `${round(mph, digits)} mph`
}

/** A speed band from a profile's mph fields: "35+ mph" or "35–65 mph"; metric "56+ km/h", "56–105 km/h". */
export function formatSpeedBandMph(minMph: number, maxMph: number | null, units: UnitSystem): string {
  const lo = formatSpeedMph(minMph, units)
  if (maxMph === null) return lo.replace(" ", "+ ")
  return `${lo.slice(0, lo.indexOf(" "))}–${formatSpeedMph(maxMph, units)}`
}

/** A road distance: miles or kilometres with one decimal ("14.4 mi", "23.2 km"). */
export function formatDistance(meters: number | null | undefined, units: UnitSystem): string {
  if (meters == null || !Number.isFinite(meters)) return "—"
  const v = units === "metric" ? meters / 1000 : mToMi(meters)
  return `${(Math.round(v * 10) / 10).toFixed(1)} ${distanceUnit(units)}`
}

/** A short length (gaps, GPS accuracy): whole feet or metres ("98 ft", "30 m"). */
export function formatLength(meters: number | null | undefined, units: UnitSystem): string {
  if (meters == null || !Number.isFinite(meters)) return "—"
  return `${round(units === "metric" ? meters : mToFt(meters), 0)} ${lengthUnit(units)}`
}

/** Gaps are logged in feet (drive-file format); shown in the shop's unit. */
export function formatLengthFt(feet: number | null | undefined, units: UnitSystem): string {
  if (feet == null || !Number.isFinite(feet)) return "—"
  return units === "metric" ? formatLength(ftToM(feet), units) : `${round(feet, 0)} ft`
}

/** A gap window from a profile's feet: "100–300 ft"; metric "30–91 m". */
export function formatLengthRangeFt(minFt: number, maxFt: number, units: UnitSystem): string {
  const lo = formatLengthFt(minFt, units)
  return `${lo.slice(0, lo.indexOf(" "))}–${formatLengthFt(maxFt, units)}`
}

/** Accelerations read in g (two decimals) with the m/s² the profile is kept in beside it: "0.35 g (3.4 m/s²)". */
export function formatAcceleration(mps2: number | null | undefined): string {
  if (mps2 == null || !Number.isFinite(mps2)) return "—"
  return `${(Math.round((mps2 / STANDARD_GRAVITY_MPS2) * 100) / 100).toFixed(2)} g (${round(mps2, 1)} m/s²)`
}

// ---- words --------------------------------------------------------------------------------------

/** "1 event", "2 events", "0 events". */
export function plural(n: number, singular: string, pluralForm = `${singular}s`): string {
  return `${n} ${n === 1 ? singular : pluralForm}`
}
