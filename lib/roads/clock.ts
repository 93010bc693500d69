// Local hour of day and weekday in the shop's time zone (IANA name, e.g. "America/Chicago").
// Every zone's offset is a whole number of quarter hours, so one look-up per quarter hour is exact.

export const WEEKDAYS = ["Sunday", "Monday", "Tuesday", "Wednesday", "Thursday", "Friday", "Saturday"] as const
const SHORT_DAY: Record<string, number> = { Sun: 0, Mon: 1, Tue: 2, Wed: 3, Thu: 4, Fri: 5, Sat: 6 }

export interface LocalSlot {
  /** 0-23 */
  hour: number
  /** 0 = Sunday ... 6 = Saturday */
  weekday: number
}

export function createLocalClock(timeZone: string) {
  const fmt = new Intl.DateTimeFormat("en-US", { timeZone, hour: "2-digit", hourCycle: "h23", weekday: "short" })
  const cache = new Map<number, LocalSlot>()
  return (tMs: number): LocalSlot => {
    const key = Math.floor(tMs / 900_000)
    let slot = cache.get(key)
    if (!slot) {
      let hour = 0
      let weekday = 0
      for (const part of fmt.formatToParts(new Date(key * 900_000))) {
        if (part.type === "hour") hour = Number(part.value) % 24
        else if (part.type === "weekday") weekday = SHORT_DAY[part.value] ?? 0
      }
      slot = { hour, weekday }
      cache.set(key, slot)
    }
    return slot
  }
}

export function localSlot(tMs: number, timeZone: string): LocalSlot {
  return createLocalClock(timeZone)(tMs)
}

export type DayKind = "weekday" | "weekend"
export function dayKindOf(weekday: number): DayKind {
  return weekday === 0 || weekday === 6 ? "weekend" : "weekday"
}

/** Hours apart on the 24-hour clock (23 and 0 are one hour apart). */
export function hoursApart(a: number, b: number): number {
  const d = Math.abs(a - b) % 24
  return Math.min(d, 24 - d)
}
