"use client"

import { zodResolver } from "@hookform/resolvers/zod"
import { useRouter } from "next/navigation"
import { useState, useSyncExternalStore } from "react"
import { useForm, useWatch } from "react-hook-form"
import type { z } from "zod"
import { apiFetch } from "@/lib/api/client"
import { Button } from "@/components/ui/button"
import { Field, Input, Select } from "@/components/ui/field"
import { formatDateTime, type UnitSystem } from "@/lib/format"
import { shopFormatSchema } from "@/lib/validation/profile"
import { shopLocationFormSchema } from "@/lib/validation/shop-location"

function Saved({ message }: { message: string | null }) {
  return (
    <p role="status" className="min-h-6 text-sm font-medium">
      {message}
    </p>
  )
}

/** A lead's own choice: an e-mail besides the notice when a drive waits for review. */
export function ReviewMailForm({ initial }: { initial: boolean }) {
  const [on, setOn] = useState(initial)
  const [message, setMessage] = useState<string | null>(null)
  async function change(next: boolean) {
    setOn(next)
    setMessage(null)
    try {
      await apiFetch("/api/me/settings", { method: "PATCH", body: { reviewMail: next } })
      setMessage(next ? "Saved: drives waiting for review also come by e-mail." : "Saved: notices in the app only.")
    } catch (error) {
      setOn(!next)
      setMessage((error as Error).message)
    }
  }
  return (
    <div className="space-y-1">
      <label className="flex min-h-12 items-center gap-3 font-medium">
        <input
          type="checkbox"
          className="size-6"
          checked={on}
          onChange={(e) => void change(e.target.checked)}
          data-testid="review-mail"
        />
        E-mail me when a drive waits for my review
      </label>
      <Saved message={message} />
    </div>
  )
}

/**
 * The clock read once the page runs in the browser, then every 15 s; null on the server and during hydration,
 * so the first render in the browser writes exactly what the server wrote (`serverNow`) and nothing is
 * hydrated against a different minute or a different ICU.
 */
const CLOCK_STEP_MS = 15_000
function tickEvery15s(onTick: () => void) {
  const id = setInterval(onTick, CLOCK_STEP_MS)
  return () => clearInterval(id)
}
// The same value for every read within a step, as useSyncExternalStore needs; null on the server and in hydration.
const clockNow = () => Math.floor(Date.now() / CLOCK_STEP_MS) * CLOCK_STEP_MS
const noClock = () => null

function useClock(): number | null {
  return useSyncExternalStore(tickEvery15s, clockNow, noClock)
}

/** The shop's units and time zone (admin). `serverNow`: "Now: …" for the saved zone, as the server wrote it. */
export function ShopFormatForm({
  initial,
  zones,
  canEdit,
  serverNow,
}: {
  initial: { units: UnitSystem; timeZone: string }
  zones: string[]
  canEdit: boolean
  serverNow: string
}) {
  const router = useRouter()
  const now = useClock()
  const [message, setMessage] = useState<string | null>(null)
  const form = useForm<z.input<typeof shopFormatSchema>>({
    resolver: zodResolver(shopFormatSchema),
    defaultValues: initial,
  })
  const timeZone = useWatch({ control: form.control, name: "timeZone" })
  const { errors, isSubmitting } = form.formState
  async function save(values: z.output<typeof shopFormatSchema>) {
    setMessage(null)
    try {
      await apiFetch("/api/shop/settings", { method: "PATCH", body: values })
      setMessage("Saved. Pages, records and e-mails use these from now on.")
      router.refresh()
    } catch (error) {
      setMessage((error as Error).message)
    }
  }
  return (
    <form onSubmit={form.handleSubmit(save)} className="space-y-4" noValidate>
      <fieldset className="space-y-2" disabled={!canEdit}>
        <legend className="text-sm font-semibold">Units</legend>
        {(
          [
            ["imperial", "US customary: mph, miles, feet"],
            ["metric", "Metric: km/h, kilometres, metres"],
          ] as const
        ).map(([value, label]) => (
          <label key={value} className="flex min-h-12 items-center gap-3">
            <input
              type="radio"
              value={value}
              className="size-5"
              defaultChecked={initial.units === value}
              {...form.register("units")}
            />
            {label}
          </label>
        ))}
        <p className="text-sm text-graphite-600 dark:text-graphite-300">
          Accelerations read in g, with m/s² beside them, either way.
        </p>
      </fieldset>
      <Field
        label="Time zone"
        htmlFor="time-zone"
        hint={`Now: ${now == null ? serverNow : formatDateTime(now, timeZone, { zoneName: true })}`}
        error={errors.timeZone?.message && `Time zone ${errors.timeZone.message}.`}
      >
        <Select id="time-zone" disabled={!canEdit} defaultValue={initial.timeZone} {...form.register("timeZone")}>
          {zones.map((z) => (
            <option key={z} value={z}>
              {z.replaceAll("_", " ")}
            </option>
          ))}
        </Select>
      </Field>
      {canEdit ? (
        <Button type="submit" disabled={isSubmitting} data-testid="save-shop-format">
          Save units and time zone
        </Button>
      ) : (
        <p className="text-sm text-graphite-600 dark:text-graphite-300">An admin sets these for the whole shop.</p>
      )}
      <Saved message={message} />
    </form>
  )
}

/** The shop location's two boxes, in the order the form shows them. */
const COORDINATES = [
  { name: "lat", label: "Latitude", hint: "Decimal degrees, north positive", placeholder: "43.8731" },
  { name: "lon", label: "Longitude", hint: "Decimal degrees, east positive (west is minus)", placeholder: "-91.9187" },
] as const

/** Where the shop is (admin): the Roads page draws its map around it and takes its loops from drives starting near it. */
export function ShopLocationForm({
  initial,
  canEdit,
}: {
  initial: { lat: number; lon: number } | null
  canEdit: boolean
}) {
  const router = useRouter()
  const [message, setMessage] = useState<string | null>(null)
  // The inputs carry their values in the server's HTML too (defaultValue), so the form reads right before it hydrates.
  const form = useForm<z.input<typeof shopLocationFormSchema>, unknown, z.output<typeof shopLocationFormSchema>>({
    resolver: zodResolver(shopLocationFormSchema),
    defaultValues: { lat: initial ? String(initial.lat) : "", lon: initial ? String(initial.lon) : "" },
  })
  const { errors, isSubmitting } = form.formState
  async function save(location: z.output<typeof shopLocationFormSchema>) {
    setMessage(null)
    try {
      await apiFetch("/api/shop/settings", { method: "PATCH", body: { location } })
      setMessage(
        location
          ? "Saved. The Roads page draws its map around this place."
          : "Saved: no location. The Roads page takes the middle of where drives start.",
      )
      router.refresh()
    } catch (err) {
      setMessage((err as Error).message)
    }
  }
  return (
    <form onSubmit={form.handleSubmit(save)} className="space-y-4" data-testid="shop-location-form" noValidate>
      <div className="grid gap-3 sm:grid-cols-2">
        {COORDINATES.map(({ name, label, hint, placeholder }) => (
          <Field key={name} label={label} htmlFor={`shop-${name}`} hint={hint} error={errors[name]?.message}>
            <Input
              id={`shop-${name}`}
              inputMode="decimal"
              autoComplete="off"
              placeholder={placeholder}
              disabled={!canEdit}
              defaultValue={initial ? String(initial[name]) : ""}
              {...form.register(name)}
            />
          </Field>
        ))}
      </div>
      {canEdit ? (
        <div className="flex flex-wrap gap-2">
          <Button type="submit" disabled={isSubmitting} data-testid="save-shop-location">
            Save location
          </Button>
          {initial ? (
            <Button
              type="button"
              variant="outline"
              disabled={isSubmitting}
              onClick={() => form.reset({ lat: "", lon: "" })}
            >
              Clear
            </Button>
          ) : null}
        </div>
      ) : (
        <p className="text-sm text-graphite-600 dark:text-graphite-300">An admin sets the shop&apos;s location.</p>
      )}
      <Saved message={message} />
    </form>
  )
}
