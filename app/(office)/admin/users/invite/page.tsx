import type { Metadata } from "next";
import Link from "next/link";
import { getTranslations } from "next-intl/server";
import { listInvitationChoices } from "@/db/queries/invitations";
import { ROLES } from "@/lib/auth/schemas";
import { requirePageUser } from "@/lib/auth/session";
import { env } from "@/lib/env";
import { InviteUserForm } from "./invite-user-form";

export async function generateMetadata(): Promise<Metadata> {
  const t = await getTranslations("auth.inviteUser");
  return { title: t("title") };
}

export default async function InviteUserPage() {
  const user = await requirePageUser(["admin"]);
  const [t, tRoles, choices] = await Promise.all([
    getTranslations("auth.inviteUser"),
    getTranslations("common.roles"),
    listInvitationChoices(user),
  ]);
  return (
    <section aria-labelledby="invite-heading" className="mx-auto max-w-2xl space-y-4">
      <p>
        <Link href="/admin/users" className="font-semibold text-water-700 underline">
          {t("back")}
        </Link>
      </p>
      <h1 id="invite-heading">{t("title")}</h1>
      <p className="text-soil-700">{t("intro", { hours: env.INVITE_TTL_HOURS })}</p>
      <div className="card">
        <InviteUserForm
          roles={ROLES.map((value) => ({ value, label: tRoles(value) }))}
          regions={choices.regions}
          accounts={choices.accounts}
        />
      </div>
    </section>
  );
}
