import Link from "next/link";
import type { ReactNode } from "react";
import { Wordmark } from "@/app/_components/mark";

export default function AuthLayout({ children }: { children: ReactNode }) {
  return (
    <div className="min-h-screen">
      <header className="mx-auto max-w-5xl px-6 py-5">
        <Link href="/">
          <Wordmark />
        </Link>
      </header>
      <main className="mx-auto flex max-w-5xl justify-center px-6 pb-16 pt-6">
        <div className="w-full max-w-[420px]">{children}</div>
      </main>
    </div>
  );
}
