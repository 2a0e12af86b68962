import "server-only";
import { getServerSession } from "next-auth";
import { notFound, redirect } from "next/navigation";
import type { Role } from "@/db/schema";
import { findActiveSessionUser, type SessionUser } from "@/db/queries/users";
import { authOptions } from "./options";

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
  if (!user) redirect("/sign-in");
  if (roles && !roles.includes(user.role)) notFound();
  return user;
}
