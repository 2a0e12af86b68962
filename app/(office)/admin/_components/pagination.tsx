import Link from "next/link";
import { getTranslations } from "next-intl/server";

// Previous / next links that keep the current filters.
export async function Pagination({
  basePath,
  params,
  page,
  pageSize,
  total,
}: {
  basePath: string;
  params: Record<string, string | undefined>;
  page: number;
  pageSize: number;
  total: number;
}) {
  const t = await getTranslations("admin.pagination");
  const pages = Math.max(1, Math.ceil(total / pageSize));
  if (pages <= 1 && page <= 1) return null;
  const href = (p: number) => {
    const qs = new URLSearchParams();
    for (const [k, v] of Object.entries(params)) if (v) qs.set(k, v);
    if (p > 1) qs.set("page", String(p));
    const s = qs.toString();
    return s ? `${basePath}?${s}` : basePath;
  };
  return (
    <nav aria-label={t("label")} className="flex flex-wrap items-center justify-between gap-3">
      {page > 1 ? (
        <Link className="btn-secondary" href={href(Math.min(page - 1, pages))} rel="prev">
          {t("previous")}
        </Link>
      ) : (
        <span />
      )}
      <p>{t("pageOf", { page, pages })}</p>
      {page < pages ? (
        <Link className="btn-secondary" href={href(page + 1)} rel="next">
          {t("next")}
        </Link>
      ) : (
        <span />
      )}
    </nav>
  );
}
