"use client"

import { zodResolver } from "@hookform/resolvers/zod"
import { useState } from "react"
import { useForm } from "react-hook-form"
import { Button } from "@/components/ui/button"
import { Field, Input } from "@/components/ui/field"
import { ApiError, api } from "@/lib/api/client"
import { ROLE_HOME } from "@/lib/auth/roles"
import { signInSchema, type SignInInput } from "@/lib/validation/session"

export function SignInForm() {
  const [problem, setProblem] = useState<string | null>(null)
  const form = useForm<SignInInput>({ resolver: zodResolver(signInSchema), defaultValues: { email: "", password: "" } })

  async function onSubmit(values: SignInInput) {
    setProblem(null)
    try {
      const { user } = await api.signIn(values)
      window.location.assign(ROLE_HOME[user.role] ?? "/")
    } catch (error) {
      setProblem(error instanceof ApiError && error.message ? error.message : "Could not sign in.")
    }
  }

  const { errors, isSubmitting } = form.formState
  return (
    <form onSubmit={form.handleSubmit(onSubmit)} className="space-y-4" noValidate>
      <Field label="E-mail" htmlFor="email" error={errors.email?.message && `E-mail ${errors.email.message}.`}>
        <Input id="email" type="email" autoComplete="username" inputMode="email" {...form.register("email")} />
      </Field>
      <Field
        label="Password"
        htmlFor="password"
        error={errors.password?.message && `Password ${errors.password.message}.`}
      >
        <Input id="password" type="password" autoComplete="current-password" {...form.register("password")} />
      </Field>
      {problem ? (
        <p
          role="alert"
          className="rounded-lg border-2 border-stop-500 bg-stop-500/10 p-3 font-medium text-stop-700 dark:text-stop-400"
        >
          {problem}
        </p>
      ) : null}
      <Button type="submit" size="lg" className="w-full" disabled={isSubmitting}>
        {isSubmitting ? "Signing in…" : "Sign in"}
      </Button>
    </form>
  )
}
