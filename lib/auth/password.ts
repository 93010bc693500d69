import { hash, verify } from "@node-rs/argon2"

// Argon2id with the OWASP-recommended minimum (19 MiB, 2 passes, 1 lane).
const OPTIONS = { memoryCost: 19456, timeCost: 2, outputLen: 32, parallelism: 1 }

export function hashPassword(password: string) {
  return hash(password, OPTIONS)
}

export async function verifyPassword(passwordHash: string, password: string) {
  try {
    return await verify(passwordHash, password)
  } catch {
    return false
  }
}

// Checked against when the e-mail is unknown, so both failures take about as long.
let dummyHash: Promise<string> | undefined
export async function verifyAgainstDummy(password: string) {
  dummyHash ??= hashPassword("not-a-real-password-0000")
  await verifyPassword(await dummyHash, password)
  return false
}
