import { z } from "zod"

const schema = z.object({
  DATABASE_URL: z.string().min(1),
  // A streaming replica for analytics and list reads (db/client.ts getReadDb); unset: everything reads the primary.
  DATABASE_REPLICA_URL: z.string().optional(),
  APP_URL: z.string().url().default("http://127.0.0.1:3000"),
  APP_SECRET: z.string().min(16).default("development-only-secret-change-me"),
  NODE_ENV: z.enum(["development", "production", "test"]).default("development"),
  TRUST_PROXY: z
    .string()
    .optional()
    .transform((v) => v === "1" || v === "true"),
  SECURE_COOKIES: z
    .string()
    .optional()
    .transform((v) => v === "1" || v === "true"),
  S3_ENDPOINT: z.string().optional(),
  S3_REGION: z.string().default("us-east-1"),
  S3_BUCKET: z.string().default("straightaway"),
  S3_ACCESS_KEY_ID: z.string().optional(),
  S3_SECRET_ACCESS_KEY: z.string().optional(),
  SMTP_URL: z.string().optional(),
  MAIL_FROM: z.string().default("Straightaway <records@straightaway.invalid>"),
  MAIL_FAKE_URL: z.string().optional(),
})

export type Env = z.infer<typeof schema>

let cached: Env | undefined

/** Parsed once, on first use (not at import, so `next build` needs no database). */
export function env(): Env {
  cached ??= schema.parse(process.env)
  return cached
}
