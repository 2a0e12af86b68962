import type { Metadata } from "next";
import { getTranslations } from "next-intl/server";
import { DigsView } from "../_components/lazy-views";

export const metadata: Metadata = { title: "Digs" };

export default async function DigsPage() {
  const t = await getTranslations("field.digs");
  return (
    <>
      <h1>{t("title")}</h1>
      <p className="mt-1 mb-4 text-soil-700">{t("intro")}</p>
      <DigsView />
    </>
  );
}
