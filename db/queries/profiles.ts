import type { Transaction } from "kysely"
import {
  defaultRoadTestChecks,
  resolveProfile,
  type Profile,
  type ResolvedProfile,
  type RoadTestCheck,
} from "@/lib/drive-file"
import { storedRoadTestChecks } from "@/lib/drive-file/road-test"
import type { Db } from "../client"
import type { Database } from "../types"
import { personName, selectInShop, updateInShop } from "./shop-scope"

/** A profile at one version, settings resolved (every drive-file profile key filled). */
export type ProfileVersionInfo = {
  profileId: string
  key: string
  name: string
  sensor: string | null
  version: number
  versionId: string
  settings: ResolvedProfile
  /** The version's road-test checks; a version stored before road tests existed reads as its sensor's defaults. */
  roadTestChecks: RoadTestCheck[]
}

function versionQuery(db: Db, shopId: string) {
  return selectInShop(db, "condition_profile as p", shopId)
    .innerJoin("condition_profile_version as v", (j) =>
      j.onRef("v.profile_id", "=", "p.id").onRef("v.version", "=", "p.current_version").on("v.shop_id", "=", shopId),
    )
    .select([
      "p.id as profileId",
      "p.key",
      "p.name",
      "p.sensor",
      "v.version",
      "v.id as versionId",
      "v.settings",
      "v.road_test_checks",
    ])
}

/** A row of versionQuery: the version as stored, before toInfo resolves its settings and checks. */
type VersionRow = Omit<ProfileVersionInfo, "settings" | "roadTestChecks"> & {
  settings: Profile
  road_test_checks: RoadTestCheck[] | null
}

function toInfo({ road_test_checks, ...row }: VersionRow): ProfileVersionInfo {
  return {
    ...row,
    settings: resolveProfile(row.settings),
    roadTestChecks: storedRoadTestChecks(road_test_checks, row.sensor),
  }
}

/** The current version of the shop's profile with this key (archived ones too, unless told: old links keep working). */
export async function findCurrentProfileVersionByKey(
  db: Db,
  key: string,
  shopId: string,
  { includeArchived = true } = {},
): Promise<ProfileVersionInfo | undefined> {
  let q = versionQuery(db, shopId).where("p.key", "=", key)
  if (!includeArchived) q = q.where("p.archived", "=", false)
  const row = await q.executeTakeFirst()
  return row ? toInfo(row) : undefined
}

export async function findCurrentProfileVersionById(
  db: Db,
  profileId: string,
  shopId: string,
): Promise<ProfileVersionInfo | undefined> {
  const row = await versionQuery(db, shopId).where("p.id", "=", profileId).executeTakeFirst()
  return row ? toInfo(row) : undefined
}

export async function listProfiles(db: Db, shopId: string, { includeArchived = true } = {}) {
  let q = versionQuery(db, shopId).select([
    "p.archived",
    "p.created_at as createdAt",
    "v.created_at as versionCreatedAt",
  ])
  if (!includeArchived) q = q.where("p.archived", "=", false)
  const rows = await q.orderBy("p.archived").orderBy("p.name").execute()
  return rows.map((r) => ({
    ...toInfo(r),
    archived: r.archived,
    createdAt: r.createdAt,
    versionCreatedAt: r.versionCreatedAt,
  }))
}

export function listProfileVersions(db: Db, profileId: string, shopId: string) {
  return selectInShop(db, "condition_profile_version as v", shopId)
    .select(["v.id", "v.version", "v.settings", "v.road_test_checks", "v.created_at as createdAt"])
    .select((eb) => personName(db, eb.ref("v.created_by"), shopId).as("createdByName"))
    .where("v.profile_id", "=", profileId)
    .orderBy("v.version", "desc")
    .execute()
}

export function findProfileInShop(db: Db, profileId: string, shopId: string) {
  return selectInShop(db, "condition_profile", shopId).selectAll().where("id", "=", profileId).executeTakeFirst()
}

export function findProfileByKey(db: Db, key: string, shopId: string) {
  return selectInShop(db, "condition_profile", shopId).select(["id"]).where("key", "=", key).executeTakeFirst()
}

/** The profile a new task of this sensor gets by default: the shop's oldest active profile for the sensor. */
export function findDefaultProfileForSensor(db: Db, sensor: string, shopId: string) {
  return selectInShop(db, "condition_profile", shopId)
    .select(["id"])
    .where("sensor", "=", sensor)
    .where("archived", "=", false)
    .orderBy("created_at")
    .orderBy("key")
    .executeTakeFirst()
}

export async function insertProfile(
  db: Db,
  input: {
    shopId: string
    key: string
    name: string
    sensor: string | null
    settings: ResolvedProfile
    userId: string
    roadTestChecks?: RoadTestCheck[]
  },
) {
  const profile = await db
    .insertInto("condition_profile")
    .values({ shop_id: input.shopId, key: input.key, name: input.name, sensor: input.sensor, current_version: 1 })
    .returning(["id"])
    .executeTakeFirstOrThrow()
  await db
    .insertInto("condition_profile_version")
    .values({
      shop_id: input.shopId,
      profile_id: profile.id,
      version: 1,
      settings: JSON.stringify(input.settings),
      road_test_checks: JSON.stringify(input.roadTestChecks ?? defaultRoadTestChecks(input.sensor)),
      created_by: input.userId,
    })
    .execute()
  return profile.id
}

/**
 * Adds a version and makes it current. Old versions are never changed, so a drive that points at one keeps
 * the settings it was scored with. Locks the profile row so two edits cannot take the same number.
 */
export async function insertProfileVersion(
  db: Transaction<Database>,
  profileId: string,
  shopId: string,
  settings: ResolvedProfile,
  userId: string,
  roadTestChecks?: RoadTestCheck[],
) {
  const profile = await selectInShop(db, "condition_profile", shopId)
    .select(["current_version"])
    .where("id", "=", profileId)
    .forUpdate()
    .executeTakeFirstOrThrow()
  const version = profile.current_version + 1
  await db
    .insertInto("condition_profile_version")
    .values({
      shop_id: shopId,
      profile_id: profileId,
      version,
      settings: JSON.stringify(settings),
      road_test_checks: roadTestChecks ? JSON.stringify(roadTestChecks) : null,
      created_by: userId,
    })
    .execute()
  await updateInShop(db, "condition_profile", shopId)
    .set({ current_version: version })
    .where("id", "=", profileId)
    .execute()
  return version
}

export function updateProfileFields(
  db: Db,
  profileId: string,
  shopId: string,
  changes: { name?: string; sensor?: string | null; archived?: boolean },
) {
  return updateInShop(db, "condition_profile", shopId).set(changes).where("id", "=", profileId).execute()
}

export function isDuplicateProfileKey(error: unknown) {
  const e = error as { code?: string; constraint?: string } | null
  return e?.code === "23505" && e.constraint === "condition_profile_shop_key_uq"
}
