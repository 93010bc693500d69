// Registry of benchmark figures, run in this order by scripts/bench.ts.
// To add a figure: write `export const myFigure: BenchFigure = {...}` in scripts/bench/<topic>.ts
// and append it below. Give it `requiresEnv` (e.g. ["DATABASE_URL"] for ingestToRawInsertRatio,
// ["BENCH_BASE_URL"] for syncSecondsFor36k) and it is reported as skipped when that is absent.
import { ingestToRawInsertRatio, syncSecondsFor36k } from "./drives"
import { exportPeakRssMb360k } from "./exports"
import { ingestAtCadenceP95Ms, ingestCeilingRatio, replayRefusalP50Ms } from "./ingest"
import { liveFanoutP95Seconds, recordingDriveGetMs36k } from "./live"
import { detailHtmlKb36k, recorderFirstLoadKb } from "./pages"
import { numbersCsvRowsP95Ms100k, numbersP95Ms100k, reviewQueueP95Ms100k } from "./reads"
import { roadModelUpdateMs, roadsPageP95Ms } from "./roads"
import { sampleBytes } from "./samples"
import { samplesScoredPerSecond, scoreToParseRatio, validateScoreToParseRatio } from "./scoring"
import type { BenchFigure } from "./types"

export const figures: BenchFigure[] = [
  scoreToParseRatio,
  validateScoreToParseRatio,
  samplesScoredPerSecond,
  // First against the app server: its peak memory is then the export's own, not what earlier figures left in the
  // heap (after the 36,000-sample import and drive page the same server peaks about 90 MB higher).
  exportPeakRssMb360k,
  ingestToRawInsertRatio,
  syncSecondsFor36k,
  recorderFirstLoadKb,
  detailHtmlKb36k,
  reviewQueueP95Ms100k,
  numbersP95Ms100k,
  numbersCsvRowsP95Ms100k,
  replayRefusalP50Ms,
  ingestCeilingRatio,
  ingestAtCadenceP95Ms,
  liveFanoutP95Seconds,
  recordingDriveGetMs36k,
  roadModelUpdateMs,
  roadsPageP95Ms,
  sampleBytes,
]
