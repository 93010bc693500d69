"use client"
import { z } from "zod"

// Zod 4 probes `new Function` once to decide whether to compile its parsers; under the content security policy
// (no 'unsafe-eval') the probe is blocked and reported as a violation, though Zod falls back. Jitless skips the probe.
z.config({ jitless: true })

export function ZodJitless() {
  return null
}
