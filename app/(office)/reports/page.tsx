import type { Metadata } from "next";
import Link from "next/link";
import { getTranslations } from "next-intl/server";
import { TableShell } from "@/app/(office)/_components/data-table";
import { listFieldReports } from "@/db/queries/reports";
import { requirePageUser } from "@/lib/auth/session";

export const metadata: Metadata = { title: "Reports" };
export const dynamic = "force-dynamic";

const th = "px-3 py-2 font-semibold";
const td = "px-3 py-2 align-top";
const time = (d: Date) => d.toISOString().slice(0, 16).replace("T", " ");
const STATUS_CLASS = {
  sent: "bg-sprout-50 text-sprout-900 border-sprout-700",
  sending: "bg-water-50 text-soil-900 border-water-700",
  failed: "bg-burn-50 text-burn-700 border-burn-700",
} as const;

// The field reports of the accounts the user may see (a grower: their own farm), newest first.
export default async function ReportsPage() {
  const user = await requirePageUser();
  const t = await getTranslations("reports.list");
  const reports = await listFieldReports(user);
  return (
    <section aria-labelledby="reports-heading" className="space-y-4">
      <h1 id="reports-heading">{t("title")}</h1>
      <p className="text-soil-700">{t("intro")}</p>
      <TableShell caption={t("caption")} captionHidden isEmpty={reports.length === 0} empty={t("empty")}>
        <thead className="bg-soil-50">
          <tr>
            <th scope="col" className={th}>
              {t("date")}
            </th>
            <th scope="col" className={th}>
              {t("field")}
            </th>
            <th scope="col" className={th}>
              {t("account")}
            </th>
            <th scope="col" className={th}>
              {t("sentBy")}
            </th>
            <th scope="col" className={th}>
              {t("recipients")}
            </th>
            <th scope="col" className={th}>
              {t("status")}
            </th>
            <th scope="col" className={th}>
              {t("download")}
            </th>
          </tr>
        </thead>
        <tbody>
          {reports.map((r) => (
            <tr key={r.id} className="border-t border-soil-200">
              <th scope="row" className={`${td} font-semibold whitespace-nowrap`}>
                {time(r.createdAt)}
              </th>
              <td className={td}>
                <Link href={`/fields/${r.fieldId}/report`} className="underline">
                  {r.fieldName}
                </Link>
              </td>
              <td className={td}>{r.accountName}</td>
              <td className={td}>{r.createdByName ?? ""}</td>
              <td className={`${td} break-all`}>{r.recipients.join(", ")}</td>
              <td className={td}>
                <span
                  className={`inline-block rounded border-l-4 px-2 py-1 text-sm ${STATUS_CLASS[r.status]}`}
                >
                  {t(`statuses.${r.status}`)}
                </span>
                {r.sentAt ? (
                  <span className="block text-sm text-soil-700">{t("sentAt", { time: time(r.sentAt) })}</span>
                ) : null}
                {r.status === "failed" && r.error ? (
                  <span className="block text-sm text-burn-700">{t("error", { error: r.error })}</span>
                ) : null}
              </td>
              <td className={td}>
                <a
                  href={`/api/reports/${r.id}`}
                  className="inline-flex min-h-tap items-center font-semibold underline"
                  aria-label={t("downloadLabel", { field: r.fieldName, date: time(r.createdAt) })}
                >
                  {t("download")}
                </a>
              </td>
            </tr>
          ))}
        </tbody>
      </TableShell>
    </section>
  );
}
