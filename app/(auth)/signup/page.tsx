import type { Metadata } from "next";
import Link from "next/link";
import { SignUpForm } from "./sign-up-form";

export const metadata: Metadata = { title: "Create a workspace" };

export default function SignUpPage() {
  return (
    <div>
      <h1 className="mb-1 text-[22px]">Create your firm&apos;s workspace</h1>
      <p className="mb-6 text-ink-2">
        14 days with every calculation pack, no card needed. Already have an account?{" "}
        <Link className="text-copper underline-offset-2 hover:underline" href="/signin">
          Sign in
        </Link>
      </p>
      <SignUpForm />
    </div>
  );
}
