import type { Metadata } from "next";
import Link from "next/link";
import { SignInForm } from "./sign-in-form";

export const metadata: Metadata = { title: "Sign in" };

export default async function SignInPage({ searchParams }: { searchParams: Promise<Record<string, string | undefined>> }) {
  const sp = await searchParams;
  const next = sp.next && sp.next.startsWith("/") && !sp.next.startsWith("//") ? sp.next : "/w";
  return (
    <div>
      <h1 className="mb-1 text-[22px]">Sign in</h1>
      <p className="mb-6 text-ink-2">
        New to Loopwright?{" "}
        <Link className="text-copper underline-offset-2 hover:underline" href={`/signup${sp.next ? `?next=${encodeURIComponent(next)}` : ""}`}>
          Create a workspace
        </Link>
      </p>
      <SignInForm next={next} initialError={sp.error} />
    </div>
  );
}
