"use client"

import { useEffect, useState } from "react"

const STYLES = {
  date: { day: "numeric", month: "short", year: "numeric" },
  "date-time": { day: "numeric", month: "short", year: "numeric", hour: "numeric", minute: "2-digit" },
} satisfies Record<string, Intl.DateTimeFormatOptions>

/**
 * A moment in the reader's own time zone. The server does not know it, so the first paint shows the date in
 * UTC (said so), and the browser puts in local time once it runs.
 */
export function LocalTime({ iso, style = "date-time", className }: { iso: string; style?: keyof typeof STYLES; className?: string }) {
  const [local, setLocal] = useState<string | null>(null)
  useEffect(() => {
    setLocal(new Date(iso).toLocaleString(undefined, STYLES[style]))
  }, [iso, style])
  return (
    <time dateTime={iso} className={className}>
      {local ?? `${new Date(iso).toLocaleString("en-GB", { ...STYLES[style], timeZone: "UTC" })}${style === "date" ? "" : " UTC"}`}
    </time>
  )
}
