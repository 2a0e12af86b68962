import type { Metadata } from "next";
import { redirect } from "next/navigation";
import { getTranslations } from "next-intl/server";
import { safeReturnPath } from "@/lib/auth/return-to";
import { getSessionUser } from "@/lib/auth/session";
import { SignInForm } from "./sign-in-form";

export async function generateMetadata(): Promise<Metadata> {
  const t = await getTranslations("auth.signIn");
  return { title: t("title") };
}

export default async function SignInPage({
  searchParams,
}: {
  searchParams: Promise<{ error?: string; next?: string }>;
}) {
  const { error, next } = await searchParams;
  const returnTo = safeReturnPath(next);
  if (await getSessionUser()) redirect(returnTo);
  const t = await getTranslations("auth.signIn");
  return (
    <>
      <h1>{t("title")}</h1>
      <p className="mt-1 mb-4 text-soil-700">{t("intro")}</p>
      <SignInForm initialError={error ?? null} returnTo={returnTo} />
    </>
  );
}
