"use client";

import { useTranslations } from "next-intl";

// Shown while the views that read this phone's database load, tall enough that the page below it
// does not jump when they arrive.
export function ReadingPlaceholder() {
  const t = useTranslations("field.today");
  return (
    <div className="min-h-[75dvh]">
      <p role="status">{t("loading")}</p>
    </div>
  );
}
