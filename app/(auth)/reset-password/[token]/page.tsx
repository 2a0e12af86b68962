import type { Metadata } from "next";
import Link from "next/link";
import { getTranslations } from "next-intl/server";
import { inspectToken } from "@/db/queries/one-time-tokens";
import { MIN_PASSWORD_LENGTH } from "@/lib/auth/password";
import { tokenSchema } from "@/lib/auth/schemas";
import { NewPasswordForm } from "../../_components/new-password-form";

export async function generateMetadata(): Promise<Metadata> {
  const t = await getTranslations("auth.reset");
  return { title: t("title"), robots: { index: false } };
}

export default async function ResetPasswordTokenPage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  const t = await getTranslations("auth");
  const link = tokenSchema.safeParse(token).success
    ? await inspectToken(token, "password_reset", "active")
    : ({ state: "invalid" } as const);

  if (link.state !== "valid") {
    return (
      <>
        <h1>{t("reset.title")}</h1>
        <div className="mt-4 space-y-4">
          <p className="notice-error" role="alert">
            {t(`link.${link.state}`)}
          </p>
          <Link href="/reset-password" className="btn-primary w-full">
            {t("link.requestNew")}
          </Link>
          <Link href="/sign-in" className="btn-secondary w-full">
            {t("reset.backToSignIn")}
          </Link>
        </div>
      </>
    );
  }

  return (
    <>
      <h1>{t("reset.title")}</h1>
      <p className="mt-1 mb-4 text-soil-700">{t("reset.intro", { email: link.user.email })}</p>
      <NewPasswordForm kind="reset" token={token} email={link.user.email} minLength={MIN_PASSWORD_LENGTH} />
    </>
  );
}
