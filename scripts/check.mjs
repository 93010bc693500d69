// `npm run check` (and the first step of a full `npm test`): type checks of the app and of the service worker,
// ESLint (Next's and typescript-eslint's rules plus the layer boundaries), Prettier's format check and knip's
// dead-code check. Exits non-zero on the first failing step, naming it.
import { log, npx, run } from "./lib/shell.mjs"

export const CHECKS = [
  ["types (app)", "tsc", ["--noEmit", "-p", "tsconfig.json"]],
  ["types (service worker)", "tsc", ["--noEmit", "-p", "tsconfig.sw.json"]],
  ["lint", "eslint", [".", "--max-warnings", "0"]],
  ["format", "prettier", ["--check", "--log-level", "warn", "."]],
  ["dead code", "knip", ["--no-progress"]],
]

export function runChecks() {
  for (const [name, bin, args] of CHECKS) {
    log(`Check: ${name}`)
    const status = run(npx(bin), args, { check: false }).status
    if (status !== 0) {
      log(`Check failed: ${name} (npx ${bin} ${args.join(" ")})`)
      return false
    }
  }
  return true
}

if (import.meta.url === `file://${process.argv[1]}`) process.exit(runChecks() ? 0 : 1)
