import type { Metadata } from "next";
import Link from "next/link";
import { requirePageUser } from "@/lib/auth/page";
import { Wordmark } from "@/app/_components/mark";
import { NewWorkspaceForm } from "./new-workspace-form";

export const metadata: Metadata = { title: "New workspace" };

export default async function NewWorkspacePage() {
  await requirePageUser("/w/new");
  return (
    <div className="mx-auto max-w-md px-6 py-10">
      <Link href="/w" className="mb-8 inline-block">
        <Wordmark />
      </Link>
      <h1 className="mb-2 text-[22px]">New workspace</h1>
      <p className="mb-6 text-ink-2">A workspace is one firm: its members, projects, parts library and signing identity. It starts with a 14-day trial.</p>
      <NewWorkspaceForm />
    </div>
  );
}
