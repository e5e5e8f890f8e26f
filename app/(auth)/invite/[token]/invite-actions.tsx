"use client";

import { signIn, signOut } from "next-auth/react";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import { z } from "zod";
import { Button, Field, LinkButton, Notice, TextInput } from "@/app/_components/ui";
import { api, ApiError } from "@/lib/api-client";
import { passwordSchema, personNameSchema } from "@/lib/auth/schemas";

const schema = z.object({ name: personNameSchema, password: passwordSchema });
type Values = z.input<typeof schema>;

export function InviteActions({ token, invitedEmail, accountExists, signedInEmail }: { token: string; invitedEmail: string; accountExists: boolean; signedInEmail?: string }) {
  const router = useRouter();
  const [error, setError] = useState<string>();
  const [busy, setBusy] = useState(false);
  const { register, handleSubmit, formState } = useForm<Values>({ resolver: zodResolver(schema) });
  const url = `/api/invitations/${encodeURIComponent(token)}/accept`;

  async function join() {
    setBusy(true);
    setError(undefined);
    try {
      const r = await api<{ workspaceSlug: string }>(url, { method: "POST", body: {} });
      router.push(`/w/${r.workspaceSlug}/projects`);
      router.refresh();
    } catch (e) {
      setError(e instanceof ApiError ? e.message : "Joining failed. Try again.");
      setBusy(false);
    }
  }

  const createAndJoin = handleSubmit(async (v) => {
    setError(undefined);
    try {
      const r = await api<{ workspaceSlug: string }>(url, { method: "POST", body: v });
      const res = await signIn("password", { email: invitedEmail, password: v.password, redirect: false });
      if (!res || res.error) return setError("Your account was created and you joined, but signing in failed. Please sign in.");
      router.push(`/w/${r.workspaceSlug}/projects`);
      router.refresh();
    } catch (e) {
      setError(e instanceof ApiError ? e.message : "Joining failed. Try again.");
    }
  });

  if (signedInEmail && signedInEmail !== invitedEmail) {
    return (
      <div className="space-y-3">
        <Notice tone="warning">
          You are signed in as {signedInEmail}. This invitation is for {invitedEmail}: sign out, then sign in or create an account with that e-mail.
        </Notice>
        <Button onClick={() => signOut({ callbackUrl: `/invite/${token}` })}>Sign out</Button>
      </div>
    );
  }
  if (signedInEmail) {
    return (
      <div className="space-y-3">
        {error ? <Notice tone="error">{error}</Notice> : null}
        <Button variant="primary" onClick={join} disabled={busy}>
          {busy ? "Joining…" : "Accept and join"}
        </Button>
      </div>
    );
  }
  if (accountExists) {
    return (
      <div className="space-y-3">
        <p className="text-ink-2">You already have a Loopwright account. Sign in to accept.</p>
        <LinkButton variant="primary" href={`/signin?next=${encodeURIComponent(`/invite/${token}`)}`}>
          Sign in to accept
        </LinkButton>
      </div>
    );
  }
  return (
    <form onSubmit={createAndJoin} noValidate className="space-y-4">
      {error ? <Notice tone="error">{error}</Notice> : null}
      <p className="text-ink-2">Create your account to accept.</p>
      <Field label="Your name" htmlFor="name" error={formState.errors.name?.message}>
        <TextInput id="name" autoComplete="name" autoFocus aria-invalid={!!formState.errors.name} {...register("name")} />
      </Field>
      <Field label="Choose a password" htmlFor="password" error={formState.errors.password?.message} hint="At least 10 characters.">
        <TextInput id="password" type="password" autoComplete="new-password" aria-invalid={!!formState.errors.password} {...register("password")} />
      </Field>
      <Button type="submit" variant="primary" disabled={formState.isSubmitting}>
        {formState.isSubmitting ? "Joining…" : "Create account and join"}
      </Button>
    </form>
  );
}
