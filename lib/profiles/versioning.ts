// When a profile change makes a new version: pure, so the rule is checked without a database.
import { resolveProfile, type ResolvedProfile } from "@/lib/drive-file"
import type { RoadTestCheck } from "@/lib/drive-file/road-test"
import type { Profile } from "@/lib/drive-file/schema"

type Version = { settings: ResolvedProfile; roadTestChecks: RoadTestCheck[] }

/**
 * The version a change of settings or road-test checks makes, or null when it changes neither (a form saved as it
 * was). Older versions are never edited: drives scored under them keep what they were scored against.
 */
export function nextProfileVersion(
  current: Version,
  change: { settings?: Profile | undefined; roadTestChecks?: RoadTestCheck[] | undefined },
): Version | null {
  if (!change.settings && !change.roadTestChecks) return null
  const next = {
    settings: change.settings ? resolveProfile(change.settings) : current.settings,
    roadTestChecks: change.roadTestChecks ?? current.roadTestChecks,
  }
  const same =
    JSON.stringify(next.settings) === JSON.stringify(current.settings) &&
    JSON.stringify(next.roadTestChecks) === JSON.stringify(current.roadTestChecks)
  return same ? null : next
}
