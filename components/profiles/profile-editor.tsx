"use client"

import { useRouter } from "next/navigation"
import { useState } from "react"
import { useForm } from "react-hook-form"
import { apiFetch } from "@/lib/api/client"
import { Button } from "@/components/ui/button"
import { Card } from "@/components/ui/card"
import { Field, Input, Select } from "@/components/ui/field"
import { FormDone, FormProblem, Options } from "@/components/ui/form"
import { roadTestChecksSchema, type ResolvedProfile, type RoadTestCheck } from "@/lib/drive-file"
import { SENSOR_LABEL, SENSORS } from "@/lib/validation/job"
import { profileSettingsSchema } from "@/lib/validation/profile"
import { issuesToFields } from "@/lib/validation/zod-fields"
import { formatShown, fromDisplay, PROFILE_FIELDS, toDisplay, unitLabel, type Units } from "./profile-fields"
import { fromDrafts, RoadTestChecksEditor, toDrafts } from "./road-test-checks-editor"

type Values = { name: string; sensor: string; fields: Record<string, string> }

const fieldKey = (name: string) => name.replace(".", "_")

/**
 * Creates a profile or saves a new version of one. Values are shown in the shop's units; a box left as it
 * was keeps its stored value exactly, so a save never drifts a number through rounding.
 */
export function ProfileEditor({
  profile,
  settings,
  units,
  canEdit,
  roadTestChecks,
}: {
  profile?: { id: string; name: string; sensor: string | null }
  settings: ResolvedProfile
  /** An existing profile's road-test checks; a new profile gets its sensor's defaults. */
  roadTestChecks?: RoadTestCheck[]
  units: Units
  canEdit: boolean
}) {
  const router = useRouter()
  const [problem, setProblem] = useState<string | null>(null)
  const [done, setDone] = useState<string | null>(null)
  const [checkDrafts, setCheckDrafts] = useState(() => toDrafts(roadTestChecks ?? [], units))
  const [checkErrors, setCheckErrors] = useState<Record<string, string>>({})
  const shown = Object.fromEntries(
    PROFILE_FIELDS.map((f) => {
      const v = f.get(settings)
      return [fieldKey(f.name), v === null ? "" : formatShown(toDisplay(f.kind, v, units), f.kind)]
    }),
  )
  const form = useForm<Values>({
    defaultValues: { name: profile?.name ?? "", sensor: profile?.sensor ?? "", fields: shown },
  })
  const { errors, isSubmitting } = form.formState

  function toSettings(values: Values) {
    const out: Record<string, unknown> = { leadGapFt: {} }
    for (const f of PROFILE_FIELDS) {
      const text = values.fields[fieldKey(f.name)]?.trim() ?? ""
      let value: number | null
      if (text === shown[fieldKey(f.name)]) value = f.get(settings)
      else if (text === "" && f.nullable) value = null
      else value = text === "" ? Number.NaN : fromDisplay(f.kind, Number(text), units)
      const [a, b] = f.name.split(".")
      if (b) (out[a!] as Record<string, unknown>)[b] = value
      else out[a!] = value
    }
    return out
  }

  async function save(values: Values) {
    setProblem(null)
    setDone(null)
    if (!values.name.trim()) {
      form.setError("name", { message: "is required" })
      return
    }
    const parsed = profileSettingsSchema.safeParse(toSettings(values))
    if (!parsed.success) {
      for (const [path, message] of Object.entries(issuesToFields(parsed.error.issues))) {
        const f = PROFILE_FIELDS.find((x) => x.name === path)
        form.setError(`fields.${fieldKey(f?.name ?? path)}`, { message: message.replace(/\b(mph|ft|m)\b/g, "") })
      }
      return
    }
    let checks: RoadTestCheck[] | undefined
    if (roadTestChecks) {
      const c = roadTestChecksSchema.safeParse(fromDrafts(checkDrafts, units))
      setCheckErrors(
        c.success
          ? {}
          : Object.fromEntries(
              Object.entries(issuesToFields(c.error.issues)).map(([k, v]) => [`roadTestChecks.${k}`, v]),
            ),
      )
      if (!c.success) return
      checks = c.data
    }
    const body = {
      name: values.name,
      sensor: values.sensor || null,
      settings: parsed.data,
      ...(checks ? { roadTestChecks: checks } : {}),
    }
    try {
      if (profile) {
        const res = await apiFetch<{ profile: { version: number } }>(`/api/profiles/${profile.id}`, {
          method: "PATCH",
          body,
        })
        setDone(`Saved. Current version: ${res.profile.version}.`)
        router.refresh()
      } else {
        const res = await apiFetch<{ profile: { id: string } }>("/api/profiles", { method: "POST", body })
        router.push(`/profiles/${res.profile.id}`)
      }
    } catch (error) {
      setProblem(error instanceof Error ? error.message : "That did not save.")
    }
  }

  return (
    <form onSubmit={form.handleSubmit(save)} noValidate className="space-y-4">
      <Card className="space-y-3">
        <Field label="Name" htmlFor="profile-name" error={errors.name?.message}>
          <Input id="profile-name" disabled={!canEdit} {...form.register("name")} />
        </Field>
        <Field
          label="For sensor"
          htmlFor="profile-sensor"
          hint="New calibrations of this sensor get this profile by default."
        >
          <Select id="profile-sensor" disabled={!canEdit} {...form.register("sensor")}>
            <option value="">Any (chosen by hand)</option>
            <Options values={SENSORS} labels={SENSOR_LABEL} />
          </Select>
        </Field>
      </Card>
      <Card className="grid gap-3 sm:grid-cols-2">
        {PROFILE_FIELDS.map((f) => {
          const key = fieldKey(f.name)
          return (
            <Field
              key={f.name}
              label={`${f.label} (${unitLabel(f.kind, units)})`}
              htmlFor={`pf-${key}`}
              hint={f.hint}
              error={errors.fields?.[key]?.message}
            >
              <Input
                id={`pf-${key}`}
                inputMode="decimal"
                className="tabular"
                disabled={!canEdit}
                {...form.register(`fields.${key}`)}
              />
            </Field>
          )
        })}
      </Card>
      {roadTestChecks ? (
        <RoadTestChecksEditor
          drafts={checkDrafts}
          onChange={setCheckDrafts}
          sensor={profile?.sensor ?? null}
          canEdit={canEdit}
          errors={checkErrors}
          units={units}
        />
      ) : (
        <p className="text-sm text-graphite-600 dark:text-graphite-300">
          A new profile starts with its sensor&apos;s usual road-test checks; edit them once it is created.
        </p>
      )}
      <FormProblem>{problem}</FormProblem>
      <FormDone>{done}</FormDone>
      {canEdit ? (
        <div className="space-y-1">
          <Button type="submit" variant="signal" disabled={isSubmitting}>
            {isSubmitting ? "Saving…" : profile ? "Save as a new version" : "Create profile"}
          </Button>
          {profile ? (
            <p className="text-sm text-graphite-600 dark:text-graphite-300">
              Drives already recorded keep the version they were held to.
            </p>
          ) : null}
        </div>
      ) : null}
    </form>
  )
}
