import type { Mark2 as Mark } from "@/lib/drive-file/schema"

export interface LeadState {
  leadOn: boolean
  gapFt: number | null
}

/** Rule 4 of drive-file.md: what a lead-on, lead-off or gap mark does to the lead state (other marks do nothing). */
export function applyLeadMark(state: LeadState, m: Mark): void {
  if (m.kind === "lead-on") {
    state.leadOn = true
    state.gapFt = m.gapFt ?? null
  } else if (m.kind === "lead-off") {
    state.leadOn = false
    state.gapFt = null
  } else if (m.kind === "gap" && state.leadOn) {
    state.gapFt = m.gapFt ?? state.gapFt
  }
}
