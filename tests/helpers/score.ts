// shared/specs/drive-file.md "Score": the fields a score always has.
export const SCORE_FIELDS = [
  "verdict",
  "reasons",
  "durationSeconds",
  "distanceMeters",
  "gapSeconds",
  "qualifyingSeconds",
  "followingSeconds",
  "qualifyingSecondsBeforeClear",
  "followingSecondsBeforeClear",
  "clearedAtSeconds",
  "harshEvents",
  "samplesUsed",
  "samplesDropped",
  "conditions",
] as const

/** The condition keys every score lists (drive-file.md "Score", `conditions`). */
export const ALWAYS_CONDITIONS = ["qualifying-time", "following-time", "cleared", "verified"] as const
