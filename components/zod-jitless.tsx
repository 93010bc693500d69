"use client"
// Only zod's core config, not the whole library: this runs on every page, the recorder's first load included.
import { config } from "zod/v4/core"

// Zod 4 probes `new Function` once to decide whether to compile its parsers; under the content security policy
// (no 'unsafe-eval') the probe is blocked and reported as a violation, though Zod falls back. Jitless skips the probe.
config({ jitless: true })

export function ZodJitless() {
  return null
}
