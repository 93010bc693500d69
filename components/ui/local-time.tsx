"use client"

import { useFormatPrefs } from "@/components/shell/format-prefs"
import { formatDate, formatDateTime } from "@/lib/format"

/**
 * A moment in the shop's time zone (its setting; lib/format), the same text on the server and in the browser.
 * `timeZone` overrides the shop's (the share page has no signed-in shop).
 */
export function LocalTime({
  iso,
  style = "date-time",
  className,
  timeZone,
}: {
  iso: string
  style?: "date" | "date-time"
  className?: string
  timeZone?: string
}) {
  const prefs = useFormatPrefs()
  const zone = timeZone ?? prefs.timeZone
  return (
    <time dateTime={iso} className={className}>
      {style === "date" ? formatDate(iso, zone) : formatDateTime(iso, zone)}
    </time>
  )
}
