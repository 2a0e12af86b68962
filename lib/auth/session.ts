import "server-only";
import { getServerSession } from "next-auth";
import { headers } from "next/headers";
import { notFound, redirect } from "next/navigation";
import type { Role } from "@/db/schema";
import { findActiveSessionUser, type SessionUser } from "@/db/queries/users";
import { authOptions } from "./options";
import { RETURN_TO_HEADER, safeReturnPath } from "./return-to";

export type { SessionUser };

// The signed-in, still-active user, or null.
export async function getSessionUser(): Promise<SessionUser | null> {
  const session = await getServerSession(authOptions);
  const id = session?.user?.id;
  if (!id) return null;
  return (await findActiveSessionUser(id)) ?? null;
}

// For pages: sends a signed-out visitor to sign in, and answers 404 to a role the page is not for.
export async function requirePageUser(roles?: Role[]): Promise<SessionUser> {
  const user = await getSessionUser();
  if (!user) {
    const back = safeReturnPath((await headers()).get(RETURN_TO_HEADER));
    redirect(back === "/" ? "/sign-in" : `/sign-in?next=${encodeURIComponent(back)}`);
  }
  if (roles && !roles.includes(user.role)) notFound();
  return user;
}
