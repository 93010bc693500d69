// Registry of benchmark figures, run in this order by scripts/bench.ts.
// To add a figure: write `export const myFigure: BenchFigure = {...}` in scripts/bench/<topic>.ts
// and append it below. Give it `requiresEnv` (e.g. ["DATABASE_URL"] for ingestToRawInsertRatio,
// ["BENCH_BASE_URL"] for syncSecondsFor36k) and it is reported as skipped when that is absent.
import { ingestToRawInsertRatio, syncSecondsFor36k } from "./drives"
import { exportPeakRssMb360k } from "./exports"
import { ingestAtCadenceP95Ms, ingestCeilingRatio, replayRefusalP50Ms } from "./ingest"
import { liveFanoutP95Seconds, recordingDriveGetMs36k } from "./live"
import { detailHtmlKb36k, recorderFirstLoadKb } from "./pages"
import { numbersP95Ms100k, reviewQueueP95Ms100k } from "./reads"
import { roadModelUpdateMs, roadsPageP95Ms } from "./roads"
import { sampleBytes } from "./samples"
import { samplesScoredPerSecond, scoreToParseRatio, validateScoreToParseRatio } from "./scoring"
import type { BenchFigure } from "./types"

export const figures: BenchFigure[] = [
  scoreToParseRatio,
  validateScoreToParseRatio,
  samplesScoredPerSecond,
  ingestToRawInsertRatio,
  syncSecondsFor36k,
  recorderFirstLoadKb,
  detailHtmlKb36k,
  exportPeakRssMb360k,
  reviewQueueP95Ms100k,
  numbersP95Ms100k,
  replayRefusalP50Ms,
  ingestCeilingRatio,
  ingestAtCadenceP95Ms,
  liveFanoutP95Seconds,
  recordingDriveGetMs36k,
  roadModelUpdateMs,
  roadsPageP95Ms,
  sampleBytes,
]
