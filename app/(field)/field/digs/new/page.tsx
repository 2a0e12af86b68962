import type { Metadata } from "next";
import { getTranslations } from "next-intl/server";
import { Suspense } from "react";
import { requirePageUser } from "@/lib/auth/session";
import { DigEditor } from "../_components/dig-editor";

export const metadata: Metadata = { title: "New dig" };

// Only checks sign-in: the form reads and writes this phone's database, so it also works offline.
export default async function NewDigPage() {
  await requirePageUser(["rep", "supervisor", "admin"]);
  const t = await getTranslations("dig");
  return (
    <>
      <h1>{t("newTitle")}</h1>
      <p className="mt-1 mb-4 text-soil-700">{t("newIntro")}</p>
      <Suspense fallback={<p role="status">{t("loading")}</p>}>
        <DigEditor mode="new" />
      </Suspense>
    </>
  );
}
