"use client";

import { signIn } from "next-auth/react";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import { z } from "zod";
import { Button, Field, Notice, TextInput } from "@/app/_components/ui";
import { api, ApiError } from "@/lib/api-client";
import { emailSchema } from "@/lib/auth/schemas";

const schema = z.object({ email: emailSchema, password: z.string().min(1, "Password is required") });
type Values = z.input<typeof schema>;

const ERRORS: Record<string, string> = {
  CredentialsSignin: "No account matches that e-mail and password.",
  rate_limited: "Too many sign-in attempts. Wait 15 minutes and try again, or use a sign-in link.",
};

export function SignInForm({ next, initialError }: { next: string; initialError?: string }) {
  const router = useRouter();
  const [error, setError] = useState<string | undefined>(initialError ? (ERRORS[initialError] ?? "Sign-in failed. Try again.") : undefined);
  const [linkMessage, setLinkMessage] = useState<string>();
  const { register, handleSubmit, getValues, trigger, formState } = useForm<Values>({ resolver: zodResolver(schema) });

  const onSubmit = handleSubmit(async (v) => {
    setError(undefined);
    setLinkMessage(undefined);
    const res = await signIn("password", { email: v.email, password: v.password, redirect: false });
    if (!res || res.error) {
      setError(ERRORS[res?.error ?? ""] ?? (res?.status === 429 ? ERRORS.rate_limited : "Sign-in failed. Try again."));
      return;
    }
    router.push(next);
    router.refresh();
  });

  async function sendLink() {
    setError(undefined);
    setLinkMessage(undefined);
    if (!(await trigger("email"))) return;
    try {
      const r = await api<{ message: string }>("/api/auth/link", { body: { email: getValues("email"), next } });
      setLinkMessage(r.message);
    } catch (e) {
      setError(e instanceof ApiError ? e.message : "The sign-in link could not be sent.");
    }
  }

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      {error ? <Notice tone="error">{error}</Notice> : null}
      {linkMessage ? <Notice tone="success">{linkMessage}</Notice> : null}
      <Field label="E-mail" htmlFor="email" error={formState.errors.email?.message}>
        <TextInput id="email" type="email" autoComplete="email" autoFocus aria-invalid={!!formState.errors.email} {...register("email")} />
      </Field>
      <Field label="Password" htmlFor="password" error={formState.errors.password?.message}>
        <TextInput id="password" type="password" autoComplete="current-password" aria-invalid={!!formState.errors.password} {...register("password")} />
      </Field>
      <div className="flex items-center justify-between gap-3 pt-1">
        <Button type="submit" variant="primary" disabled={formState.isSubmitting}>
          {formState.isSubmitting ? "Signing in…" : "Sign in"}
        </Button>
        <Button type="button" variant="quiet" onClick={sendLink}>
          E-mail me a sign-in link
        </Button>
      </div>
    </form>
  );
}
