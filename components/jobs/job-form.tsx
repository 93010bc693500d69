"use client"

import { zodResolver } from "@hookform/resolvers/zod"
import { useQuery, useQueryClient } from "@tanstack/react-query"
import { Plus, Trash2 } from "lucide-react"
import { useRouter } from "next/navigation"
import { useState } from "react"
import { useFieldArray, useForm, useWatch, type FieldPath } from "react-hook-form"
import { Button } from "@/components/ui/button"
import { Card } from "@/components/ui/card"
import { apiFetch } from "@/lib/api/client"
import { Field, Input, Select } from "@/components/ui/field"
import { errorAt, FormProblem, Options, showApiProblem } from "@/components/ui/form"
import {
  METHOD_LABEL,
  METHODS,
  newJobSchema,
  REASON_LABEL,
  REASONS,
  SENSOR_LABEL,
  SENSORS,
  type NewJob,
  type NewJobInput,
} from "@/lib/validation/job"
import { VinField } from "./vin-field"

type ProfileOption = { id: string; name: string; sensor: string | null; version: number; archived: boolean }

export type JobFormValues = NewJobInput & { tasks: (NewJobInput["tasks"][number] & { id?: string })[] }

const BLANK: JobFormValues = {
  roNumber: "",
  customer: { name: "", email: "", phone: "" },
  vehicle: { vin: "", year: "", make: "", model: "", plate: "" },
  tasks: [{ sensor: "forward_radar", method: "dynamic", reason: "bumper_or_grille_work" }],
}

type TextInput = {
  id: string
  label: string
  hint?: string
  type?: "email" | "tel"
  inputMode?: "email" | "tel" | "numeric"
}

/** The job's plain text inputs by form path: the input's id, its label, a hint, and the keyboard a phone shows. */
const TEXT_INPUTS = {
  roNumber: { id: "roNumber", label: "RO number" },
  "customer.name": { id: "customer-name", label: "Customer name" },
  "customer.email": {
    id: "customer-email",
    label: "Customer e-mail",
    hint: "For the drive record.",
    type: "email",
    inputMode: "email",
  },
  "customer.phone": { id: "customer-phone", label: "Customer phone", type: "tel", inputMode: "tel" },
  "vehicle.year": { id: "vehicle-year", label: "Year", hint: "Blank: from the VIN", inputMode: "numeric" },
  "vehicle.make": { id: "vehicle-make", label: "Make" },
  "vehicle.model": { id: "vehicle-model", label: "Model" },
  "vehicle.plate": { id: "vehicle-plate", label: "Plate" },
} satisfies Partial<Record<FieldPath<NewJobInput>, TextInput>>

/** New job (POST) or, with `jobId`, an edit of one (PATCH). The same zod schema checks here and on the server. */
export function JobForm({ jobId, initial }: { jobId?: string; initial?: JobFormValues }) {
  const router = useRouter()
  const queryClient = useQueryClient()
  const [problem, setProblem] = useState<string | null>(null)
  const form = useForm<NewJobInput, unknown, NewJob>({
    resolver: zodResolver(newJobSchema),
    defaultValues: initial ?? BLANK,
    mode: "onTouched",
  })
  const tasks = useFieldArray({ control: form.control, name: "tasks" })
  const profiles = useQuery({
    queryKey: ["profiles"],
    queryFn: () => apiFetch<{ profiles: ProfileOption[] }>("/api/profiles"),
  })
  const { errors, isSubmitting } = form.formState
  const vin = useWatch({ control: form.control, name: "vehicle.vin" }) ?? ""
  const chosenYear = useWatch({ control: form.control, name: "vehicle.year" })

  async function save(values: NewJob) {
    setProblem(null)
    // A blank profile choice leaves the task with its current (or the sensor's default) profile.
    const body = { ...values, tasks: values.tasks.map((t) => ({ ...t, profileId: t.profileId || undefined })) }
    try {
      const { job } = await apiFetch<{ job: { id: string } }>(jobId ? `/api/jobs/${jobId}` : "/api/jobs", {
        method: jobId ? "PATCH" : "POST",
        body,
      })
      await queryClient.invalidateQueries({ queryKey: ["jobs"] })
      await queryClient.invalidateQueries({ queryKey: ["job", job.id] })
      router.push(`/jobs/${job.id}`)
      router.refresh()
    } catch (error) {
      setProblem(showApiProblem(form, error, "That did not work."))
    }
  }

  const err = (path: string) => errorAt(errors, path)
  /** A grid of the job's plain text inputs, in the order named. */
  const textInputs = (className: string, names: (keyof typeof TEXT_INPUTS)[]) => (
    <div className={className}>
      {names.map((name) => {
        const { id, label, hint, type, inputMode }: TextInput = TEXT_INPUTS[name]
        return (
          <Field key={name} label={label} htmlFor={id} error={err(name)} hint={hint}>
            <Input id={id} type={type} inputMode={inputMode} autoComplete="off" {...form.register(name)} />
          </Field>
        )
      })}
    </div>
  )

  return (
    <form onSubmit={form.handleSubmit(save)} className="space-y-4" noValidate>
      <Card className="space-y-3">
        <h2 className="text-lg font-bold">Repair order</h2>
        {textInputs("grid gap-3 sm:grid-cols-[minmax(0,1fr)_minmax(0,2fr)]", ["roNumber", "customer.name"])}
        {textInputs("grid gap-3 sm:grid-cols-2", ["customer.email", "customer.phone"])}
      </Card>

      <Card className="space-y-3">
        <h2 className="text-lg font-bold">Vehicle</h2>
        <VinField
          value={vin}
          serverError={err("vehicle.vin")}
          chosenYear={String(chosenYear ?? "")}
          onChooseYear={(y) => form.setValue("vehicle.year", String(y), { shouldDirty: true })}
          {...form.register("vehicle.vin")}
        />
        {textInputs("grid grid-cols-2 gap-3 sm:grid-cols-4", [
          "vehicle.year",
          "vehicle.make",
          "vehicle.model",
          "vehicle.plate",
        ])}
      </Card>

      <Card className="space-y-3">
        <h2 className="text-lg font-bold">Calibrations</h2>
        <FormProblem className="text-sm">{err("tasks")}</FormProblem>
        {tasks.fields.map((field, i) => (
          <fieldset
            key={field.id}
            className="space-y-3 rounded-lg border border-graphite-200 p-3 dark:border-asphalt-700"
            data-testid={`task-${i}`}
          >
            <legend className="px-1 text-sm font-semibold">Calibration {i + 1}</legend>
            <div className="grid gap-3 sm:grid-cols-3">
              <Field label="Sensor" htmlFor={`task-${i}-sensor`} error={err(`tasks.${i}.sensor`)}>
                <Select id={`task-${i}-sensor`} {...form.register(`tasks.${i}.sensor`)}>
                  <Options values={SENSORS} labels={SENSOR_LABEL} />
                </Select>
              </Field>
              <Field label="Method" htmlFor={`task-${i}-method`} error={err(`tasks.${i}.method`)}>
                <Select id={`task-${i}-method`} {...form.register(`tasks.${i}.method`)}>
                  <Options values={METHODS} labels={METHOD_LABEL} />
                </Select>
              </Field>
              <Field label="Why" htmlFor={`task-${i}-reason`} error={err(`tasks.${i}.reason`)}>
                <Select id={`task-${i}-reason`} {...form.register(`tasks.${i}.reason`)}>
                  <Options values={REASONS} labels={REASON_LABEL} />
                </Select>
              </Field>
            </div>
            <Field label="Condition profile" htmlFor={`task-${i}-profile`} error={err(`tasks.${i}.profileId`)}>
              <Select id={`task-${i}-profile`} {...form.register(`tasks.${i}.profileId`)}>
                <option value="">{jobId ? "Keep (or the sensor's default)" : "The sensor's default"}</option>
                {(profiles.data?.profiles ?? [])
                  .filter((p) => !p.archived)
                  .map((p) => (
                    <option key={p.id} value={p.id}>
                      {p.name} (version {p.version})
                    </option>
                  ))}
              </Select>
            </Field>
            {tasks.fields.length > 1 ? (
              <Button variant="ghost" size="sm" onClick={() => tasks.remove(i)}>
                <Trash2 aria-hidden className="size-4" /> Remove calibration {i + 1}
              </Button>
            ) : null}
          </fieldset>
        ))}
        <Button
          variant="outline"
          onClick={() => tasks.append({ sensor: "forward_radar", method: "dynamic", reason: "bumper_or_grille_work" })}
        >
          <Plus aria-hidden className="size-5" /> Add a calibration
        </Button>
      </Card>

      <FormProblem>{problem}</FormProblem>
      <Button type="submit" variant="signal" size="lg" className="w-full sm:w-auto" disabled={isSubmitting}>
        {isSubmitting ? "Saving…" : jobId ? "Save changes" : "Open the job"}
      </Button>
    </form>
  )
}
