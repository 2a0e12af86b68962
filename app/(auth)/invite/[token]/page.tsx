import type { Metadata } from "next";
import Link from "next/link";
import { getTranslations } from "next-intl/server";
import { inspectToken } from "@/db/queries/one-time-tokens";
import { MIN_PASSWORD_LENGTH } from "@/lib/auth/password";
import { tokenSchema } from "@/lib/auth/schemas";
import { NewPasswordForm } from "../../_components/new-password-form";

export async function generateMetadata(): Promise<Metadata> {
  const t = await getTranslations("auth.invite");
  return { title: t("title"), robots: { index: false } };
}

export default async function InvitePage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  const t = await getTranslations("auth");
  const link = tokenSchema.safeParse(token).success
    ? await inspectToken(token, "invite", "invited")
    : ({ state: "invalid" } as const);

  if (link.state !== "valid") {
    return (
      <>
        <h1>{t("invite.title")}</h1>
        <div className="mt-4 space-y-4">
          <div className="notice-error" role="alert">
            <p>{t(`link.${link.state}`)}</p>
            {link.state === "used" ? null : <p className="mt-2">{t("link.askAdmin")}</p>}
          </div>
          <Link href="/sign-in" className="btn-secondary w-full">
            {t("link.goSignIn")}
          </Link>
        </div>
      </>
    );
  }

  return (
    <>
      <h1>{t("invite.title")}</h1>
      <p className="mt-1 mb-4 text-soil-700">
        {t("invite.intro", { name: link.user.name, email: link.user.email })}
      </p>
      <NewPasswordForm kind="invite" token={token} email={link.user.email} minLength={MIN_PASSWORD_LENGTH} />
    </>
  );
}
