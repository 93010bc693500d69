// npm run --silent score -- FILE
// Prints the score JSON and exits 0 (a not_met drive is still a successful scoring).
// Unreadable, non-JSON or invalid input: exit 2 with one line on stderr naming the path and the problem.
import { readFileSync } from "node:fs"
import { formatParseError, parseAnyDriveFile } from "@/lib/drive-file"
import { scoreDrive } from "@/lib/scoring"

function fail(line: string): never {
  process.stderr.write(line.replace(/\s*\n\s*/g, " ") + "\n")
  process.exit(2)
}

const path = process.argv.slice(2).find((a) => a !== "--")
if (!path) fail("usage: npm run --silent score -- FILE")

let text: string
try {
  text = readFileSync(path, "utf8")
} catch (err) {
  const code = (err as NodeJS.ErrnoException).code
  fail(`${path}: cannot read the file${code ? ` (${code})` : ""}`)
}

let json: unknown
try {
  json = JSON.parse(text)
} catch (err) {
  fail(`${path}: not valid JSON (${(err as Error).message})`)
}

const parsed = parseAnyDriveFile(json)
if (!parsed.ok) fail(formatParseError(parsed))

process.stdout.write(JSON.stringify(scoreDrive(parsed.file), null, 2) + "\n")
