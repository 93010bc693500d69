export { scoreDrive, createLiveScorer } from "./score"

export { predictMinutesLeft } from "./predict"

export { geodesicDistanceM } from "./geodesy"

export type { Score } from "./types"
export { worseVerdict } from "./road-test"
