"use client";

import { signIn } from "next-auth/react";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import type { z } from "zod";
import { Button, Field, Notice, TextInput } from "@/app/_components/ui";
import { api, ApiError } from "@/lib/api-client";
import { signUpSchema } from "@/lib/auth/schemas";

type Values = z.input<typeof signUpSchema>;

export function SignUpForm() {
  const router = useRouter();
  const [error, setError] = useState<string>();
  const { register, handleSubmit, setError: setFieldError, formState } = useForm<Values>({ resolver: zodResolver(signUpSchema) });
  const errs = formState.errors;

  const onSubmit = handleSubmit(async (v) => {
    setError(undefined);
    try {
      const r = await api<{ workspaceSlug: string }>("/api/signup", { body: v });
      const res = await signIn("password", { email: v.email, password: v.password, redirect: false });
      if (!res || res.error) return setError("Your account was created, but signing in failed. Please sign in.");
      router.push(`/w/${r.workspaceSlug}/projects`);
      router.refresh();
    } catch (e) {
      if (e instanceof ApiError) {
        for (const [k, m] of Object.entries(e.fields)) if (k in v) setFieldError(k as keyof Values, { message: m });
        setError(e.message);
      } else setError("Sign-up failed. Try again.");
    }
  });

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      {error ? <Notice tone="error">{error}</Notice> : null}
      <Field label="Your name" htmlFor="name" error={errs.name?.message}>
        <TextInput id="name" autoComplete="name" autoFocus aria-invalid={!!errs.name} {...register("name")} />
      </Field>
      <Field label="Work e-mail" htmlFor="email" error={errs.email?.message}>
        <TextInput id="email" type="email" autoComplete="email" aria-invalid={!!errs.email} {...register("email")} />
      </Field>
      <Field label="Password" htmlFor="password" error={errs.password?.message} hint="At least 10 characters.">
        <TextInput id="password" type="password" autoComplete="new-password" aria-invalid={!!errs.password} {...register("password")} />
      </Field>
      <Field label="Firm name" htmlFor="workspaceName" error={errs.workspaceName?.message} hint="The workspace your team shares. You can create more later.">
        <TextInput id="workspaceName" autoComplete="organization" aria-invalid={!!errs.workspaceName} {...register("workspaceName")} />
      </Field>
      <Button type="submit" variant="primary" disabled={formState.isSubmitting}>
        {formState.isSubmitting ? "Creating…" : "Create workspace"}
      </Button>
    </form>
  );
}
