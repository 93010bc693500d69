"use client"

import { zodResolver } from "@hookform/resolvers/zod"
import { UserPlus } from "lucide-react"
import { useState } from "react"
import { useForm } from "react-hook-form"
import { Button } from "@/components/ui/button"
import { Card } from "@/components/ui/card"
import { apiFetch } from "@/lib/api/client"
import { Field, Input, Select } from "@/components/ui/field"
import { FormProblem, Options } from "@/components/ui/form"
import { ROLE_LABEL, ROLES, type Role } from "@/lib/auth/roles"
import { newUserSchema, type NewUserInput } from "@/lib/validation/user"

type Person = { id: string; email: string; name: string; role: Role; disabled: boolean }

export function UserAdmin({ meId, initialUsers }: { meId: string; initialUsers: Person[] }) {
  const [users, setUsers] = useState(initialUsers)
  const [problem, setProblem] = useState<string | null>(null)
  // Disabling ends the person's sessions at once, so it is asked twice; every change says on screen that it saved.
  const [confirming, setConfirming] = useState<string | null>(null)
  const [saved, setSaved] = useState<{ id: string; text: string } | null>(null)
  const form = useForm<NewUserInput>({
    resolver: zodResolver(newUserSchema),
    defaultValues: { email: "", name: "", role: "technician", password: "" },
  })

  async function send(url: string, method: string, body: unknown) {
    setProblem(null)
    try {
      return (await apiFetch<{ user: Person }>(url, { method, body })).user
    } catch (error) {
      setProblem(error instanceof Error ? error.message : "That did not work.")
      return null
    }
  }

  async function add(values: NewUserInput) {
    const created = await send("/api/users", "POST", values)
    if (created) {
      setUsers((list) => [...list, created].sort((a, b) => a.name.localeCompare(b.name)))
      form.reset()
    }
  }

  async function change(id: string, changes: Partial<Pick<Person, "role" | "disabled">>) {
    setSaved(null)
    const updated = await send(`/api/users/${id}`, "PATCH", changes)
    if (updated) {
      setUsers((list) => list.map((u) => (u.id === id ? updated : u)))
      setSaved({
        id,
        text:
          changes.role !== undefined
            ? `Saved: ${updated.name} is now ${ROLE_LABEL[updated.role]}.`
            : updated.disabled
              ? `Saved: ${updated.name} is disabled and signed out everywhere.`
              : `Saved: ${updated.name} can sign in again.`,
      })
    }
    setConfirming(null)
  }

  const { errors, isSubmitting } = form.formState
  return (
    <div className="grid gap-4 lg:grid-cols-[2fr_1fr]">
      <Card className="p-0">
        <ul className="divide-y divide-graphite-200 dark:divide-asphalt-700">
          {users.map((u) => (
            <li key={u.id} className="flex flex-wrap items-center gap-3 p-3" data-testid={`person-${u.email}`}>
              <div className="min-w-40 flex-1">
                <p className="font-semibold">
                  {u.name}{" "}
                  {u.disabled ? (
                    <span className="ml-1 rounded bg-graphite-200 px-2 py-0.5 text-xs dark:bg-asphalt-700">
                      Disabled
                    </span>
                  ) : null}
                </p>
                <p className="text-sm text-graphite-600 dark:text-graphite-300">{u.email}</p>
              </div>
              <label className="sr-only" htmlFor={`role-${u.id}`}>
                Role of {u.name}
              </label>
              <Select
                id={`role-${u.id}`}
                className="w-40"
                value={u.role}
                disabled={u.id === meId}
                onChange={(e) => change(u.id, { role: e.target.value as Role })}
              >
                <Options values={ROLES} labels={ROLE_LABEL} />
              </Select>
              <Button
                variant={u.disabled ? "outline" : "ghost"}
                disabled={u.id === meId}
                onClick={() => (u.disabled ? change(u.id, { disabled: false }) : setConfirming(u.id))}
                aria-expanded={u.disabled ? undefined : confirming === u.id}
              >
                {u.disabled ? "Enable" : "Disable"}
              </Button>
              {confirming === u.id ? (
                <div
                  role="alertdialog"
                  aria-label={`Disable ${u.name}?`}
                  className="basis-full space-y-2 rounded-lg border-2 border-stop-500 p-3"
                  data-testid="confirm-disable"
                >
                  <p className="font-medium">
                    Disable {u.name}? They are signed out on every phone at once and cannot sign in until you enable
                    them again.
                  </p>
                  <div className="flex flex-wrap gap-2">
                    <Button
                      variant="danger"
                      onClick={() => change(u.id, { disabled: true })}
                      data-testid="confirm-disable-yes"
                    >
                      Disable and sign out
                    </Button>
                    <Button variant="outline" onClick={() => setConfirming(null)}>
                      Keep {u.name.split(" ")[0]}
                    </Button>
                  </div>
                </div>
              ) : null}
              {saved?.id === u.id ? (
                <p
                  role="status"
                  className="basis-full text-sm font-medium text-teal-700 dark:text-teal-300"
                  data-testid="person-saved"
                >
                  {saved.text}
                </p>
              ) : null}
            </li>
          ))}
        </ul>
      </Card>
      <Card>
        <h2 className="mb-3 flex items-center gap-2 text-lg font-bold">
          <UserPlus aria-hidden className="size-5" /> Add a person
        </h2>
        <form onSubmit={form.handleSubmit(add)} className="space-y-3" noValidate>
          <Field label="Name" htmlFor="new-name" error={errors.name?.message}>
            <Input id="new-name" {...form.register("name")} />
          </Field>
          <Field label="E-mail" htmlFor="new-email" error={errors.email?.message}>
            <Input id="new-email" type="email" {...form.register("email")} />
          </Field>
          <Field label="Role" htmlFor="new-role">
            <Select id="new-role" {...form.register("role")}>
              <Options values={ROLES} labels={ROLE_LABEL} />
            </Select>
          </Field>
          <Field
            label="First password"
            htmlFor="new-password"
            error={errors.password?.message}
            hint="At least 12 characters. Share it in person."
          >
            <Input id="new-password" type="password" autoComplete="new-password" {...form.register("password")} />
          </Field>
          <FormProblem>{problem}</FormProblem>
          <Button type="submit" className="w-full" disabled={isSubmitting}>
            Add
          </Button>
        </form>
      </Card>
    </div>
  )
}
