"use client";

import { signIn } from "next-auth/react";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { Button, LinkButton, Notice } from "@/app/_components/ui";

/** The link's token is used only when the person presses the button (mail scanners that open
 * links must not use up the single-use token). */
export function LinkSignIn({ token, next }: { token: string; next: string }) {
  const router = useRouter();
  const [state, setState] = useState<"idle" | "busy" | "failed">("idle");
  async function go() {
    setState("busy");
    const res = await signIn("link", { token, redirect: false });
    if (!res || res.error) return setState("failed");
    router.push(next);
    router.refresh();
  }
  return (
    <div className="space-y-4">
      <h1 className="text-[22px]">Sign in with your link</h1>
      {state === "failed" || !token ? (
        <>
          <Notice tone="error">This sign-in link is not valid any more: it was already used, it expired (links last 15 minutes), or it is incomplete.</Notice>
          <LinkButton href="/signin">Request a new link</LinkButton>
        </>
      ) : (
        <Button variant="primary" onClick={go} disabled={state === "busy"}>
          {state === "busy" ? "Signing in…" : "Continue to Loopwright"}
        </Button>
      )}
    </div>
  );
}
