import type { Metadata } from "next";
import Link from "next/link";
import { getTranslations } from "next-intl/server";
import { env } from "@/lib/env";
import { ResetRequestForm } from "./reset-request-form";

// Rendered per request so the link lifetime shown follows the running configuration.
export const dynamic = "force-dynamic";

export async function generateMetadata(): Promise<Metadata> {
  const t = await getTranslations("auth.reset");
  return { title: t("requestTitle") };
}

export default async function ResetPasswordPage() {
  const t = await getTranslations("auth.reset");
  return (
    <>
      <h1>{t("requestTitle")}</h1>
      <p className="mt-1 mb-4 text-soil-700">{t("requestIntro")}</p>
      <ResetRequestForm ttlMinutes={env.RESET_TTL_MINUTES} />
      <p className="mt-4 text-center">
        <Link href="/sign-in" className="font-semibold text-water-700 underline">
          {t("backToSignIn")}
        </Link>
      </p>
    </>
  );
}
