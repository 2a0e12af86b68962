import Link from "next/link";
import { getTranslations } from "next-intl/server";

export default async function NotFound() {
  const t = await getTranslations("common.errors");
  return (
    <main id="main" className="mx-auto max-w-xl p-gutter">
      <h1>{t("notFoundTitle")}</h1>
      <p className="mt-2">{t("notFoundBody")}</p>
      <Link href="/" className="btn-secondary mt-4">
        {t("backHome")}
      </Link>
    </main>
  );
}
