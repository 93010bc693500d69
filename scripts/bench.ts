// npm run bench [-- --json] [-- --only a,b]: prints each figure with its target; --json prints one JSON object;
// --only runs just the named figures.
import { figures } from "./bench/index"
import type { BenchContext, BenchResult } from "./bench/types"

const asJson = process.argv.includes("--json")
const cache = new Map<string, unknown>()
const ctx: BenchContext = {
  env: process.env,
  memo<T>(key: string, make: () => T): T {
    if (!cache.has(key)) cache.set(key, make())
    return cache.get(key) as T
  },
}

const onlyAt = process.argv.indexOf("--only")
const only = onlyAt >= 0 ? new Set((process.argv[onlyAt + 1] ?? "").split(",").filter(Boolean)) : null

const results: BenchResult[] = []
for (const f of figures) {
  if (only && !only.has(f.name)) continue
  const missing = (f.requiresEnv ?? []).filter((name) => !process.env[name])
  const base = { name: f.name, target: f.target, ...(f.unit ? { unit: f.unit } : {}) }
  if (missing.length > 0) {
    results.push({ ...base, skipped: true, reason: `${missing.join(", ")} not set` })
  } else {
    const value = await f.run(ctx)
    results.push({ ...base, value: Math.round(value * 1000) / 1000, meets: f.meets(value) })
  }
  if (!asJson) {
    const r = results.at(-1)!
    const unit = r.unit ? ` ${r.unit}` : ""
    console.log(
      "skipped" in r
        ? `${r.name}: skipped (${r.reason}); target ${r.target}${unit}`
        : `${r.name}: ${r.value}${unit} (target ${r.target}${unit}) ${r.meets ? "ok" : "MISSED"}`,
    )
  }
}

if (asJson) {
  const out: Record<string, unknown> = {}
  for (const { name, ...rest } of results) out[name] = rest
  console.log(JSON.stringify({ figures: out }))
}
