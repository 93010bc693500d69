import { spawnSync } from "node:child_process"
import { mkdtempSync, rmSync, writeFileSync } from "node:fs"
import { tmpdir } from "node:os"
import path from "node:path"
import { afterAll, describe, expect, it } from "vitest"
import { generateDrive } from "@/lib/tracks"

const root = path.resolve(__dirname, "../..")
const dir = mkdtempSync(path.join(tmpdir(), "score-cli-"))
afterAll(() => rmSync(dir, { recursive: true, force: true }))

function runCli(file: string) {
  return spawnSync(path.join(root, "node_modules/.bin/tsx"), [path.join(root, "scripts/score.ts"), file], {
    cwd: root,
    encoding: "utf8",
  })
}

function write(name: string, content: string): string {
  const p = path.join(dir, name)
  writeFileSync(p, content)
  return p
}

// Each case starts a Node process through tsx: on a loaded two-core machine that alone can pass 5 s.
describe("npm run score", { timeout: 60_000 }, () => {
  it("prints the score as 2-space JSON and exits 0, also for not_met", () => {
    const r = runCli(
      write("never.json", JSON.stringify(generateDrive({ seed: 3, minutes: 2, pattern: "never-cleared" }))),
    )
    expect(r.status).toBe(0)
    const score = JSON.parse(r.stdout)
    expect(score.verdict).toBe("not_met")
    expect(r.stdout).toMatch(/^\{\n  "verdict": "not_met",/)
  })

  it("exits 2 with one line naming the path and the problem for invalid input", () => {
    const bad = generateDrive({ seed: 3, minutes: 2, pattern: "never-cleared" })
    bad.samples[3]!.lat = 95
    const r = runCli(write("bad.json", JSON.stringify(bad)))
    expect(r.status).toBe(2)
    expect(r.stdout).toBe("")
    expect(r.stderr).toBe("samples[3].lat: must be between -90 and 90\n")
  })

  it("exits 2 with one line for non-JSON and for a missing file", () => {
    const notJson = runCli(write("x.json", "{ not json"))
    expect(notJson.status).toBe(2)
    expect(notJson.stderr.trim().split("\n")).toHaveLength(1)
    expect(notJson.stderr).toMatch(/not valid JSON/)
    const missing = runCli(path.join(dir, "nope.json"))
    expect(missing.status).toBe(2)
    expect(missing.stderr.trim().split("\n")).toHaveLength(1)
    expect(missing.stderr).toMatch(/cannot read the file/)
  })
})
