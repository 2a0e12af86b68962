import { getTranslations } from "next-intl/server";

export default async function FieldLoading() {
  const t = await getTranslations("fieldPage");
  return (
    <div role="status" aria-live="polite" className="space-y-4">
      <p className="text-soil-700">{t("loading")}</p>
      <div className="h-10 w-2/3 animate-pulse rounded-card bg-soil-100" />
      <div className="h-40 animate-pulse rounded-card bg-soil-100" />
    </div>
  );
}
