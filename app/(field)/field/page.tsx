import type { Metadata } from "next";
import { getTranslations } from "next-intl/server";
import { TodayView } from "./_components/lazy-views";

export const metadata: Metadata = { title: "Today" };

// The field app's home. The layout has checked the user; everything below is read from the phone.
export default async function TodayPage() {
  const t = await getTranslations("field.today");
  return (
    <>
      <h1 className="mb-4">{t("title")}</h1>
      <TodayView />
    </>
  );
}
