import { SCAN_RESULT_LABEL, type ScanResult } from "@/lib/setup"
import type { UnitSystem } from "@/lib/format"
import { CHECK_STATUS_LABEL, checkSpeed, checkSpeedWords } from "@/lib/road-test/words"
import type { RecordCheck, RecordMeasurement } from "./types"

// Words of the record's per-system section, shared by the PDF and the share page.

export function scanResultWords(result: string): string {
  return SCAN_RESULT_LABEL[result as ScanResult] ?? result
}

export function measurementWords(m: RecordMeasurement): string {
  const f = (x: number) => String(Math.round(x * 1000) / 1000)
  return `${f(m.value)} ${m.unit} (specified ${f(m.specified)} +/- ${f(m.tolerance)} ${m.unit})${m.outOfTolerance ? " - OUT OF TOLERANCE" : ""}`
}

/** A road-test check's result on the record (page, PDF, e-mail), speeds in the shop's units. */
export function checkWords(c: RecordCheck, units: UnitSystem): string {
  const status = CHECK_STATUS_LABEL[c.status] ?? c.status
  const at =
    c.speedMph === null
      ? c.status === "not_logged"
        ? ""
        : " at an unknown speed"
      : ` at ${checkSpeed(c.speedMph, units)}`
  return `${status}${at} (counts at ${checkSpeedWords(c.minSpeedMph, units)}; ${c.need === "required" ? "required" : "where equipped"})`
}

/** Cautions per system: the maker's service information and the vehicle's own confirmation come first. */
export function calibrationCautions(sensor: string, method: string): string[] {
  const out: string[] = []
  if (method !== "dynamic") {
    out.push(
      "Set-up figures are the shop's entries from the vehicle maker's service information; Straightaway holds no maker's values.",
    )
  }
  out.push("Road-test checks were tried only where safe and legal; the driver never operated the phone while moving.")
  if (sensor === "corner_radar" || sensor === "rear_radar")
    out.push("Blind-spot and cross-traffic alerts assist the driver; they never replace looking.")
  out.push(
    "The vehicle's own status (no driver-assist fault codes, the function working) has the final word over this record.",
  )
  return out
}
