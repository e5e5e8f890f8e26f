/**
 * next-auth v4 configuration: e-mail + password and single-use sign-in links, both as
 * Credentials providers; JWT sessions that carry only the user id and session version.
 */
import type { NextAuthOptions, Session } from "next-auth";
import CredentialsProvider from "next-auth/providers/credentials";
import { AppError } from "@/lib/errors";
import { checkPassword, consumeLoginToken } from "./accounts";
import { signInSchema } from "./schemas";
import { SESSION_MAX_AGE_S } from "./session";

/** The client IP of a request as seen behind at most one proxy. */
export function clientIp(headers: Record<string, string | string[] | undefined> | Headers): string {
  const get = (k: string): string | undefined => {
    if (headers instanceof Headers) return headers.get(k) ?? undefined;
    const v = headers[k];
    return Array.isArray(v) ? v[0] : v;
  };
  return (get("x-forwarded-for")?.split(",")[0] ?? get("x-real-ip") ?? "local").trim() || "local";
}

export const authOptions: NextAuthOptions = {
  session: { strategy: "jwt", maxAge: SESSION_MAX_AGE_S },
  jwt: { maxAge: SESSION_MAX_AGE_S },
  pages: { signIn: "/signin", error: "/signin" },
  providers: [
    CredentialsProvider({
      id: "password",
      name: "E-mail and password",
      credentials: { email: { type: "email" }, password: { type: "password" } },
      async authorize(credentials, req) {
        const parsed = signInSchema.safeParse(credentials ?? {});
        if (!parsed.success) return null;
        try {
          const user = await checkPassword(parsed.data.email, parsed.data.password, clientIp(req?.headers ?? {}));
          return user ? { id: user.id, email: user.email, name: user.name, sv: user.sessionVersion } : null;
        } catch (err) {
          if (err instanceof AppError && err.code === "rate_limited") throw new Error("rate_limited");
          throw err;
        }
      },
    }),
    CredentialsProvider({
      id: "link",
      name: "Sign-in link",
      credentials: { token: { type: "text" } },
      async authorize(credentials) {
        const token = typeof credentials?.token === "string" ? credentials.token : "";
        if (!token || token.length > 200) return null;
        const user = await consumeLoginToken(token);
        return user ? { id: user.id, email: user.email, name: user.name, sv: user.sessionVersion } : null;
      },
    }),
  ],
  callbacks: {
    async jwt({ token, user }) {
      // Only the id and session version live in the token; everything else is read per request.
      if (user) {
        const u = user as { id: string; sv?: number };
        return { uid: u.id, sv: u.sv ?? 1, sub: u.id };
      }
      return { uid: token.uid, sv: token.sv, sub: token.sub };
    },
    async session({ session, token }) {
      // Only the id is exposed; names and roles come from the database on each request.
      return { ...session, user: { name: null, email: null, image: null, id: String(token.uid ?? "") } as Session["user"] };
    },
  },
};
