"use client";

import { signOut } from "next-auth/react";
import { api } from "@/lib/api-client";

export function UserMenu({ name, email }: { name: string; email: string }) {
  async function everywhere() {
    if (!confirm("Sign out of Loopwright on every device and browser, including this one?")) return;
    await api("/api/me/sessions", { method: "DELETE" });
    await signOut({ callbackUrl: "/signin" });
  }
  return (
    <div className="flex items-center gap-2 text-[13px]">
      <span className="hidden text-ink-2 md:inline" title={email}>
        {name}
      </span>
      <button type="button" onClick={() => signOut({ callbackUrl: "/signin" })} className="rounded-md px-2 py-1 text-ink-3 hover:bg-ink/5 hover:text-ink">
        Sign out
      </button>
      <button type="button" onClick={everywhere} className="hidden rounded-md px-2 py-1 text-ink-3 hover:bg-ink/5 hover:text-ink lg:inline" title="End every session of your account">
        Sign out everywhere
      </button>
    </div>
  );
}
