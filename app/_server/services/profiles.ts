import "server-only"
// The profile workflows: listing, creating under a unique key, and changes where new settings make a new version.
import type { z } from "zod"
import { getDb, type Db } from "@/db/client"
import {
  findCurrentProfileVersionById,
  findProfileByKey,
  findProfileInShop,
  insertProfile,
  insertProfileVersion,
  isDuplicateProfileKey,
  listProfiles,
  listProfileVersions,
  updateProfileFields,
  type ProfileVersionInfo,
} from "@/db/queries/profiles"
import type { SessionUser } from "@/lib/auth/lucia"
import { resolveProfile } from "@/lib/drive-file"
import { storedRoadTestChecks } from "@/lib/drive-file/road-test"
import { AppError, notFound } from "@/lib/errors"
import { nextProfileVersion } from "@/lib/profiles/versioning"
import { keyFromName, type newProfileSchema, type profileChangeSchema } from "@/lib/validation/profile"

/** The shop's profiles, archived ones included, each at its current version. */
export async function listProfilesJson(user: SessionUser) {
  const rows = await listProfiles(getDb(), user.shopId)
  return rows.map((r) => ({ ...profileVersionJson(r), archived: r.archived, versionCreatedAt: r.versionCreatedAt }))
}

function profileVersionJson(p: ProfileVersionInfo) {
  return {
    id: p.profileId,
    key: p.key,
    name: p.name,
    sensor: p.sensor,
    version: p.version,
    versionId: p.versionId,
    settings: p.settings,
    roadTestChecks: p.roadTestChecks,
  }
}

/** GET /api/profiles/:id's body: the profile at its current version, and every version newest first. */
export async function loadProfileDetail(db: Db, profileId: string, shopId: string) {
  const [profile, current, versions] = await Promise.all([
    findProfileInShop(db, profileId, shopId),
    findCurrentProfileVersionById(db, profileId, shopId),
    listProfileVersions(db, profileId, shopId),
  ])
  if (!profile || !current) return undefined
  return {
    profile: { ...profileVersionJson(current), archived: profile.archived, createdAt: profile.created_at },
    versions: versions.map((v) => ({
      id: v.id,
      version: v.version,
      settings: resolveProfile(v.settings),
      roadTestChecks: storedRoadTestChecks(v.road_test_checks, profile.sensor),
      createdAt: v.createdAt,
      createdBy: v.createdByName,
    })),
  }
}

export async function profileDetail(user: SessionUser, profileId: string) {
  return (await loadProfileDetail(getDb(), profileId, user.shopId)) ?? notFound("That profile")
}

/** A new profile at version 1; its key (given, or made from the name) is unique in the shop. */
export async function createProfile(user: SessionUser, input: z.output<typeof newProfileSchema>) {
  const key = input.key ?? keyFromName(input.name)
  const db = getDb()
  const taken = () =>
    new AppError("conflict", `A profile with the key ${key} already exists.`, {
      key: "is already used by another profile",
    })
  if (await findProfileByKey(db, key, user.shopId)) throw taken()
  const profile = {
    shopId: user.shopId,
    key,
    name: input.name,
    sensor: input.sensor ?? null,
    settings: resolveProfile(input.settings),
    userId: user.id,
    roadTestChecks: input.roadTestChecks,
  }
  try {
    const id = await db.transaction().execute((trx) => insertProfile(trx, profile))
    return profileDetail(user, id)
  } catch (error) {
    if (isDuplicateProfileKey(error)) throw taken()
    throw error
  }
}

/** Name, sensor and archived change in place; changed settings become a new version (old ones stay as they were). */
export async function changeProfile(
  user: SessionUser,
  profileId: string,
  changes: z.output<typeof profileChangeSchema>,
) {
  await getDb()
    .transaction()
    .execute(async (trx) => {
      const current = (await findCurrentProfileVersionById(trx, profileId, user.shopId)) ?? notFound("That profile")
      const { settings, roadTestChecks, ...fields } = changes
      if (Object.values(fields).some((v) => v !== undefined))
        await updateProfileFields(trx, profileId, user.shopId, fields)
      const next = nextProfileVersion(current, { settings, roadTestChecks })
      if (next) await insertProfileVersion(trx, profileId, user.shopId, next.settings, user.id, next.roadTestChecks)
    })
  return profileDetail(user, profileId)
}
