// Pre-drive checklist rules: tire pressures against the door placard, and which checks keep a drive from
// starting. Pure.
import type { ChecklistData, FuelLevel, PressureUnit, Wheel } from "@/lib/validation/checklist"
import { WHEEL_LABEL, WHEELS } from "@/lib/validation/checklist"

// 1 psi = 1 lbf/in² = 4.4482216152605 N / (0.0254 m)² = 6894.757293168361 Pa. Derived from the exact
// definitions of the pound-force (0.45359237 kg × 9.80665 m/s²) and the inch (0.0254 m); NIST SP 811
// B.8 lists the rounded 6.894757 kPa.
export const KPA_PER_PSI = (0.45359237 * 9.80665) / (0.0254 * 0.0254) / 1000

export function psiToKpa(psi: number): number {
  return psi * KPA_PER_PSI
}

export function kpaToPsi(kpa: number): number {
  return kpa / KPA_PER_PSI
}

/** Default tire tolerance when the shop has set none. Common practice, no source. */
export const DEFAULT_TIRE_TOLERANCE_PSI = 3

export type TireCheck = {
  wheel: Wheel
  label: string
  pressure: number
  unit: PressureUnit
  /** reading minus placard, in the reading's unit */
  difference: number
  ok: boolean
}

/** Each wheel against the placard; a wheel more than the tolerance off either way is flagged. */
export function checkTires(tires: ChecklistData["tires"], tolerancePsi: number): TireCheck[] {
  const tolerance = tires.unit === "psi" ? tolerancePsi : psiToKpa(tolerancePsi)
  return WHEELS.map((wheel) => {
    const difference = tires[wheel] - tires.placard
    // The 1e-9 slack keeps a reading exactly at the tolerance (after a unit conversion) inside it.
    return {
      wheel,
      label: WHEEL_LABEL[wheel],
      pressure: tires[wheel],
      unit: tires.unit,
      difference,
      ok: Math.abs(difference) <= tolerance + 1e-9,
    }
  })
}

export type TaskForChecklist = { method: string; reason: string }

/**
 * The alignment check applies when the calibration follows an alignment, or when targets are set to the
 * thrust line (static or both). Common practice, no source.
 */
export function alignmentRequired(task: TaskForChecklist): boolean {
  return task.reason === "wheel_alignment" || task.method === "static" || task.method === "both"
}

const FUEL_ORDER: FuelLevel[] = ["reserve", "1/4", "1/2", "3/4", "full"]

/** Enough fuel for a 30-minute drive with margin; "reserve" is not. Common practice, no source. */
function fuelEnough(level: FuelLevel): boolean {
  return FUEL_ORDER.indexOf(level) >= FUEL_ORDER.indexOf("1/4")
}

type Blocker = { key: string; message: string }

export type ChecklistAssessment = { ready: boolean; blockers: Blocker[]; tires: TireCheck[] }

export function assessChecklist(
  data: ChecklistData,
  task: TaskForChecklist,
  tolerancePsi = DEFAULT_TIRE_TOLERANCE_PSI,
): ChecklistAssessment {
  const blockers: Blocker[] = []
  if (!data.faultCodes.none && data.faultCodes.expected.length === 0) {
    blockers.push({
      key: "faultCodes",
      message: "Read the stored fault codes: tick none, or list the ones you expect.",
    })
  }
  const tires = checkTires(data.tires, tolerancePsi)
  const unitTolerance = data.tires.unit === "psi" ? `${tolerancePsi} psi` : `${round1(psiToKpa(tolerancePsi))} kPa`
  for (const t of tires.filter((x) => !x.ok)) {
    const side = t.difference > 0 ? "over" : "under"
    blockers.push({
      key: `tires.${t.wheel}`,
      message: `${t.label} tire is ${round1(Math.abs(t.difference))} ${t.unit} ${side} the placard (allowed ${unitTolerance}): set it before driving.`,
    })
  }
  if (!data.loadNormal)
    blockers.push({ key: "loadNormal", message: "Unload the vehicle to its normal load (no heavy cargo, no trailer)." })
  if (!fuelEnough(data.fuelLevel))
    blockers.push({ key: "fuelLevel", message: "Add fuel: a drive can take 30 minutes." })
  if (!data.sensorClean) blockers.push({ key: "sensorClean", message: "Clean the sensor face and its cover." })
  if (!data.mountUndamaged)
    blockers.push({
      key: "mountUndamaged",
      message: "Fix the mount or bracket first: a bent bracket cannot be calibrated out.",
    })
  if (alignmentRequired(task) && data.alignmentChecked !== true) {
    blockers.push({ key: "alignmentChecked", message: "Check the wheel alignment (thrust line) before calibrating." })
  }
  return { ready: blockers.length === 0, blockers, tires }
}

function round1(n: number) {
  return Math.round(n * 10) / 10
}
