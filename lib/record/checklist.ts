import type { ChecklistRow } from "./types"

const KPA_PER_PSI = 6.894757 // NIST SP 811 App. B.8: 1 psi = 6.894 757 kPa

type Data = Record<string, unknown>

const bool = (v: unknown) => (typeof v === "boolean" ? v : null)
const yesNo = (v: boolean | null, yes: string, no: string, unknown = "Not recorded") =>
  v === null ? unknown : v ? yes : no

/**
 * The checklist as rows for the record. Reads the stored checklist defensively (older rows may lack keys).
 * Tires pass when each is within the shop's tolerance of the placard pressure.
 */
export function checklistRows(data: Data, tolerancePsi = 3): ChecklistRow[] {
  const rows: ChecklistRow[] = []
  const faults = (data.faultCodes ?? {}) as { none?: unknown; expected?: unknown }
  const expected = Array.isArray(faults.expected)
    ? faults.expected.filter((c): c is string => typeof c === "string")
    : []
  if (faults.none === true) rows.push({ label: "Fault codes before the drive", value: "None stored", ok: true })
  else if (expected.length)
    rows.push({ label: "Fault codes before the drive", value: `Expected: ${expected.join(", ")}`, ok: null })
  else rows.push({ label: "Fault codes before the drive", value: "Not recorded", ok: false })

  const tires = data.tires as
    { unit?: unknown; placard?: unknown; fl?: unknown; fr?: unknown; rl?: unknown; rr?: unknown } | undefined
  if (tires && typeof tires.placard === "number") {
    const unit = tires.unit === "kPa" ? "kPa" : "psi"
    const tolerance = unit === "kPa" ? tolerancePsi * KPA_PER_PSI : tolerancePsi
    const corners = (["fl", "fr", "rl", "rr"] as const).map((k) => [k, tires[k]] as const)
    const ok = corners.every(([, v]) => typeof v === "number" && Math.abs(v - (tires.placard as number)) <= tolerance)
    rows.push({
      label: `Tire pressures (placard ${tires.placard} ${unit})`,
      value: corners.map(([k, v]) => `${k.toUpperCase()} ${typeof v === "number" ? v : "?"}`).join(", "),
      ok,
    })
  } else rows.push({ label: "Tire pressures", value: "Not recorded", ok: false })

  const load = bool(data.loadNormal)
  rows.push({ label: "Load", value: yesNo(load, "Normal, no heavy cargo", "Unusual load"), ok: load })
  rows.push({
    label: "Fuel level",
    value: typeof data.fuelLevel === "string" ? data.fuelLevel : "Not recorded",
    ok: null,
  })
  const clean = bool(data.sensorClean)
  rows.push({ label: "Sensor and cover clean", value: yesNo(clean, "Yes", "No"), ok: clean })
  const mount = bool(data.mountUndamaged)
  rows.push({ label: "Sensor mount undamaged", value: yesNo(mount, "Yes", "No"), ok: mount })
  const alignment = data.alignmentChecked
  rows.push({
    label: "Wheel alignment checked",
    value: alignment === null ? "Not needed for this job" : yesNo(bool(alignment), "Yes", "No"),
    ok: alignment === null ? null : bool(alignment),
  })
  return rows
}
