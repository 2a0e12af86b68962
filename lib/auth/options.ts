import "server-only";
import type { NextAuthOptions } from "next-auth";
import CredentialsProvider from "next-auth/providers/credentials";
import { countRecentFailures, recordSignInAttempt, THROTTLE_MAX_FAILURES } from "@/db/queries/sign-in";
import { findUserByEmail } from "@/db/queries/users";
import { env } from "@/lib/env";
import { verifyPassword } from "./password";
import { signInSchema } from "./schemas";

// Error codes the sign-in page turns into plain messages (lib/i18n/messages/en/auth.json).
export const SIGN_IN_ERRORS = ["InvalidInput", "WrongCredentials", "TooManyAttempts", "Deactivated"] as const;

// Compared against when the e-mail is unknown, so a wrong address costs as long as a wrong password.
const DUMMY_HASH = "$2b$12$C6UzMDM.H6dfI/f/IKxGhuA0m/Zjh8fSbcUiEOPu.p6jsgfHAUSXm";

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

export const authOptions: NextAuthOptions = {
  secret: env.NEXTAUTH_SECRET,
  // Reps work offline for days: a long session, re-checked against the database on every request.
  session: { strategy: "jwt", maxAge: 30 * 24 * 60 * 60 },
  pages: { signIn: "/sign-in", error: "/sign-in" },
  providers: [
    CredentialsProvider({
      name: "E-mail and password",
      credentials: { email: { type: "email" }, password: { type: "password" } },
      async authorize(credentials) {
        const parsed = signInSchema.safeParse(credentials ?? {});
        if (!parsed.success) throw new Error("InvalidInput");
        const { email, password } = parsed.data;

        const failures = await countRecentFailures(email);
        if (failures >= THROTTLE_MAX_FAILURES) throw new Error("TooManyAttempts");
        // Each failure after the second doubles the wait, up to 4 s.
        if (failures >= 2) await sleep(Math.min(4000, 500 * 2 ** (failures - 2)));

        const user = await findUserByEmail(email);
        const ok = await verifyPassword(password, user?.passwordHash ?? DUMMY_HASH);
        if (!user?.passwordHash || !ok) {
          await recordSignInAttempt(email, false);
          throw new Error("WrongCredentials");
        }
        if (user.status !== "active") throw new Error("Deactivated");
        await recordSignInAttempt(email, true);
        return { id: user.id, email: user.email, name: user.name, role: user.role };
      },
    }),
  ],
  callbacks: {
    async jwt({ token, user }) {
      if (user) {
        token.uid = user.id;
        token.role = (user as { role?: string }).role;
      }
      return token;
    },
    async session({ session, token }) {
      if (session.user) {
        session.user.id = String(token.uid);
        session.user.role = String(token.role);
      }
      return session;
    },
  },
};
