// The pre-drive checks the technician confirms on the recorder's start screen (common practice, no source).
// `blocker` is the prefix of the job checklist's blocker keys that the same check answers.
export const GATE_CHECKS = [
  { key: "codes", blocker: "faultCodes", text: "No stored fault codes other than the ones expected for this repair." },
  { key: "tires", blocker: "tires", text: "Tire pressures set to the placard." },
  { key: "load", blocker: "loadNormal", text: "No unusual load in the vehicle." },
  { key: "clean", blocker: "sensorClean", text: "Sensor face and the area in front of it clean." },
  { key: "mount", blocker: "mountUndamaged", text: "Sensor mount and bracket undamaged." },
] as const
