import type { Metadata } from "next";
import Link from "next/link";
import { headers } from "next/headers";
import { Wordmark } from "@/app/_components/mark";
import { Notice } from "@/app/_components/ui";
import { AppError } from "@/lib/errors";
import { clientIp, limitVerify, verifyCode, type VerifyResult } from "@/lib/reports/verify";
import { ResultCard } from "./result-card";
import { CodeForm, UploadForm } from "./verify-forms";

export const metadata: Metadata = { title: "Verify a calculation report" };
export const dynamic = "force-dynamic";

/** Public: check a report by its code (also the QR code's link) or by uploading the PDF. */
export default async function VerifyPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const sp = await searchParams;
  const code = (Array.isArray(sp.code) ? sp.code[0] : sp.code)?.trim().slice(0, 64) ?? "";
  let result: VerifyResult | null = null;
  let limited: string | null = null;
  if (code) {
    try {
      await limitVerify(clientIp(await headers()));
      result = await verifyCode(code);
    } catch (err) {
      if (err instanceof AppError && err.code === "rate_limited") limited = err.message;
      else throw err;
    }
  }
  return (
    <div className="min-h-screen">
      <header className="mx-auto flex max-w-3xl items-center justify-between px-6 py-5">
        <Link href="/">
          <Wordmark />
        </Link>
      </header>
      <main className="mx-auto max-w-3xl px-6 pb-16">
        <h1 className="text-[26px] leading-tight">Verify a calculation report</h1>
        <p className="mt-2 max-w-2xl text-ink-2">
          Every report issued with Loopwright carries a verification code and a digital signature. Enter the code to see who prepared, checked and approved the report and whether a newer
          revision replaces it; upload the PDF to check that your file is exactly the one that was issued.
        </p>
        <section className="pad mt-6 rounded-lg border border-rule p-5">
          <h2 className="mb-3 text-[15px]">By code</h2>
          <CodeForm initial={code} />
          {limited ? <Notice tone="error">{limited}</Notice> : null}
          {result ? <ResultCard result={result} /> : null}
        </section>
        <section className="mt-5 rounded-lg border border-rule bg-sheet p-5">
          <h2 className="mb-3 text-[15px]">By file</h2>
          <UploadForm />
        </section>
        <p className="mt-6 text-[12.5px] text-ink-3">
          A match means the file is byte for byte the report the firm issued; it does not re-check the engineering. A file that was changed in any way, even re-saved, no longer matches: ask
          the firm that issued it for the original.
        </p>
      </main>
    </div>
  );
}
