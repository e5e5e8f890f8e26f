"use client";

import { useRouter } from "next/navigation";

/** Switch between the user's workspaces (a native select: keyboard-friendly by default). */
export function WorkspaceSwitcher({ current, workspaces }: { current: string; workspaces: Array<{ slug: string; name: string; role: string }> }) {
  const router = useRouter();
  return (
    <label className="flex items-center gap-2">
      <span className="sr-only">Workspace</span>
      <select
        aria-label="Workspace"
        className="h-8 max-w-[240px] truncate rounded-md border border-rule bg-transparent px-2 text-[13.5px] font-medium hover:border-rule-strong focus:border-copper focus:outline-none"
        value={current}
        onChange={(e) => router.push(e.target.value === "__new" ? "/w/new" : `/w/${e.target.value}/projects`)}
      >
        {workspaces.map((w) => (
          <option key={w.slug} value={w.slug}>
            {w.name} ({w.role.toLowerCase()})
          </option>
        ))}
        <option value="__new">+ New workspace…</option>
      </select>
    </label>
  );
}
