// ESLint flat config: Next's rules (core web vitals), typescript-eslint's, and the layer boundaries of
// DEVELOPERS.md ("Layers"): lib/ is pure, components/ never reach the database, client files never import node:*.
import nextCoreWebVitals from "eslint-config-next/core-web-vitals"
import nextTypescript from "eslint-config-next/typescript"

const restricted = (patterns, message) => ({ group: patterns, message })

/** lib/ is pure: what every file under it may not import (a later block for the same files replaces, not adds). */
const LIB_PATTERNS = [
  restricted(["next", "next/*"], "lib/ is pure: no Next imports."),
  restricted(["react", "react-dom", "react/*", "react-dom/*"], "lib/ is pure: no React."),
  restricted(["@/db", "@/db/*", "@/app/*", "@/components/*"], "lib/ imports no db/, app/ or components/."),
]

const config = [
  {
    ignores: [
      "node_modules/**",
      ".next/**",
      ".next-slot*/**",
      ".data/**",
      ".test-data/**",
      ".bench-data/**",
      "public/sw.js",
      "public/workbox-*.js",
      "next-env.d.ts",
      "test-results/**",
      "coverage/**",
      "bench-results/**",
    ],
  },
  ...nextCoreWebVitals,
  ...nextTypescript,
  {
    rules: {
      "@typescript-eslint/no-unused-vars": ["error", { argsIgnorePattern: "^_", varsIgnorePattern: "^_" }],
      // `let { a, b } = this` where only some are reassigned stays one statement.
      "prefer-const": ["error", { destructuring: "all" }],
    },
  },
  {
    // Migrations run on Kysely<any> (frozen in time, no app types: Kysely's docs); tests read untyped JSON answers.
    files: ["db/migrations/**/*.ts", "tests/**/*.ts"],
    rules: { "@typescript-eslint/no-explicit-any": "off" },
  },
  {
    // Playwright's fixtures hand their value on through a callback named `use`, which is no React hook.
    files: ["tests/e2e/**/*.ts"],
    rules: { "react-hooks/rules-of-hooks": "off" },
  },
  {
    // Plain links on purpose: leaving the full-screen recorder is a full page load, and next/link's router code
    // would count against the recorder's first-load budget (recorderFirstLoadKbGzip); the not-found page is part
    // of every page's tree, so it loads no script either.
    files: ["components/cab/**/*.tsx", "components/recorder/**/*.tsx", "app/not-found.tsx"],
    rules: { "@next/next/no-html-link-for-pages": "off" },
  },
  {
    files: ["lib/**/*.{ts,tsx}"],
    rules: {
      "no-restricted-imports": [
        "error",
        {
          patterns: LIB_PATTERNS,
        },
      ],
    },
  },
  {
    // The shared zod schemas are imported by the browser's forms too: nothing that pulls node:* (HMAC, hashes).
    files: ["lib/validation/**/*.ts"],
    rules: {
      "no-restricted-imports": [
        "error",
        {
          patterns: [
            ...LIB_PATTERNS,
            restricted(
              ["node:*", "@/lib/share", "@/lib/auth/lucia", "@/lib/record/seal", "@/lib/record"],
              "schemas run in the browser's forms too: no node:* (nor lib modules that use it).",
            ),
          ],
        },
      ],
    },
  },
  {
    files: ["components/**/*.{ts,tsx}"],
    rules: {
      "no-restricted-imports": [
        "error",
        {
          patterns: [
            restricted(["@/db", "@/db/*"], "components/ never reach the database; go through a service or a route."),
            restricted(["node:*"], "components/ run in the browser: no node:* modules."),
          ],
        },
      ],
    },
  },
  {
    files: ["workers/**/*.ts"],
    rules: {
      "no-restricted-imports": [
        "error",
        { patterns: [restricted(["node:*", "@/db", "@/db/*", "@/app/*"], "the service worker runs in the browser.")] },
      ],
    },
  },
]

export default config
