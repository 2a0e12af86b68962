import { getTranslations } from "next-intl/server";

export default async function CaseLoading() {
  const t = await getTranslations("cases");
  return (
    <div role="status" aria-live="polite" className="space-y-4">
      <p className="sr-only">{t("page.loading")}</p>
      <div className="h-8 w-2/3 animate-pulse rounded bg-soil-200" />
      <div className="h-48 animate-pulse rounded-card bg-soil-100" />
      <div className="h-96 animate-pulse rounded-card bg-soil-100" />
    </div>
  );
}
