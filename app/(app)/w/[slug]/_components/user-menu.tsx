"use client";

import { signOut } from "next-auth/react";

export function UserMenu({ name, email }: { name: string; email: string }) {
  return (
    <div className="flex items-center gap-2 text-[13px]">
      <span className="hidden text-ink-2 md:inline" title={email}>
        {name}
      </span>
      <button type="button" onClick={() => signOut({ callbackUrl: "/signin" })} className="rounded-md px-2 py-1 text-ink-3 hover:bg-ink/5 hover:text-ink">
        Sign out
      </button>
    </div>
  );
}
