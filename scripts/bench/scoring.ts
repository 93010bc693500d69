import { parseDriveFile, type DriveFile } from "@/lib/drive-file"
import { scoreDrive } from "@/lib/scoring"
import { generateDrive } from "@/lib/tracks"
import { bestOfMs, type BenchContext, type BenchFigure } from "./types"

/** The benchmark drive: 1 h at 10 Hz = 36,000 samples, made by lib/tracks. */
export function hourAt10Hz(ctx: BenchContext): { file: DriveFile; text: string } {
  return ctx.memo("hour-at-10hz", () => {
    const file = generateDrive({ seed: 36_000, hz: 10, minutes: 60, pattern: "met" })
    return { file, text: JSON.stringify(file) }
  })
}

export const scoreToParseRatio: BenchFigure = {
  name: "scoreToParseRatio",
  target: "<= 1.0",
  async run(ctx) {
    const { text } = hourAt10Hz(ctx)
    const parsed = JSON.parse(text) as DriveFile
    const parseMs = bestOfMs(() => JSON.parse(text))
    const scoreMs = bestOfMs(() => scoreDrive(parsed))
    return scoreMs / parseMs
  },
  meets: (v) => v <= 1.0,
}

/** What an import, /api/score and the CLI do with a drive file's text: parse, validate, score. */
export const validateScoreToParseRatio: BenchFigure = {
  name: "validateScoreToParseRatio",
  target: "<= 1.5",
  async run(ctx) {
    const { text } = hourAt10Hz(ctx)
    const parseMs = bestOfMs(() => JSON.parse(text))
    const allMs = bestOfMs(() => {
      const parsed = parseDriveFile(JSON.parse(text))
      if (!parsed.ok) throw new Error(`the bench drive does not validate: ${parsed.path}: ${parsed.message}`)
      return scoreDrive(parsed.file)
    })
    return allMs / parseMs
  },
  meets: (v) => v <= 1.5,
}

export const samplesScoredPerSecond: BenchFigure = {
  name: "samplesScoredPerSecond",
  target: ">= 1000000",
  unit: "samples/s",
  async run(ctx) {
    const { file } = hourAt10Hz(ctx)
    const ms = bestOfMs(() => scoreDrive(file))
    return Math.round(file.samples.length / (ms / 1000))
  },
  meets: (v) => v >= 1_000_000,
}
