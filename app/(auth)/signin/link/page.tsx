import type { Metadata } from "next";
import { LinkSignIn } from "./link-sign-in";

export const metadata: Metadata = { title: "Signing in" };

export default async function LinkPage({ searchParams }: { searchParams: Promise<Record<string, string | undefined>> }) {
  const sp = await searchParams;
  const next = sp.next && sp.next.startsWith("/") && !sp.next.startsWith("//") ? sp.next : "/w";
  return <LinkSignIn token={sp.token ?? ""} next={next} />;
}
