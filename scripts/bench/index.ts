// Registry of benchmark figures, run in this order by scripts/bench.ts.
// To add a figure: write `export const myFigure: BenchFigure = {...}` in scripts/bench/<topic>.ts
// and append it below. Give it `requiresEnv` (e.g. ["DATABASE_URL"] for ingestToRawInsertRatio,
// ["BENCH_BASE_URL"] for syncSecondsFor36k) and it is reported as skipped when that is absent.
import { ingestToRawInsertRatio, syncSecondsFor36k } from "./drives"
import { liveFanoutP95Seconds, recordingDriveGetMs36k } from "./live"
import { recorderFirstLoadKb } from "./pages"
import { roadModelUpdateMs, roadsPageP95Ms } from "./roads"
import { samplesScoredPerSecond, scoreToParseRatio } from "./scoring"
import type { BenchFigure } from "./types"

export const figures: BenchFigure[] = [
  scoreToParseRatio,
  samplesScoredPerSecond,
  ingestToRawInsertRatio,
  syncSecondsFor36k,
  recorderFirstLoadKb,
  liveFanoutP95Seconds,
  recordingDriveGetMs36k,
  roadModelUpdateMs,
  roadsPageP95Ms,
]
