// `npm run bench [-- --json]`: the figures that need the running app get their own throwaway stack (database,
// fakes, production build) unless BASE_URL and DATABASE_URL name one already. Set-up chatter goes to stderr,
// so that with --json standard output is the one JSON object.
import { npx, run } from "./lib/shell.mjs"
import { startStack } from "./lib/stack.mjs"

process.env.STRAIGHTAWAY_LOG_STDERR = "1"
let stack = null
let env = process.env
if (!process.env.BASE_URL || !process.env.DATABASE_URL) {
  stack = await startStack({
    name: "bench",
    port: Number(process.env.BENCH_PORT ?? 3150),
    pgPort: Number(process.env.BENCH_PGPORT ?? 54349),
    s3Port: Number(process.env.BENCH_S3_PORT ?? 14589),
    smtpPort: Number(process.env.BENCH_SMTP_PORT ?? 12545),
  })
  env = { ...stack.env, BASE_URL: stack.baseUrl, BENCH_SERVER_PID: String(stack.server.pid), NODE_ENV: "production" }
}
let code = 1
try {
  const res = run(npx("tsx"), ["scripts/bench.ts", ...process.argv.slice(2)], { env, check: false, stdout: true })
  code = res.status ?? 1
} finally {
  await stack?.stop()
}
process.exit(code)
