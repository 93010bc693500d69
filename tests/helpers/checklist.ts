import type { ChecklistData } from "@/lib/validation/checklist"

/**
 * A pre-drive checklist a technician would save for a drive learn: no fault codes, every tire at the placard,
 * load normal, sensor clean, mount undamaged, alignment checked. `overrides` replace whole fields.
 */
export function checklistBody(overrides: Partial<ChecklistData> = {}): ChecklistData {
  return {
    faultCodes: { none: true, expected: [] },
    tires: { unit: "psi", placard: 35, fl: 35, fr: 35, rl: 35, rr: 35 },
    loadNormal: true,
    fuelLevel: "3/4",
    sensorClean: true,
    mountUndamaged: true,
    alignmentChecked: true,
    notes: "",
    ...overrides,
  }
}
