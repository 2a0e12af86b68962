import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { getFormatter, getTranslations } from "next-intl/server";
import { findAccountAccess } from "@/db/queries/access";
import { findAccount } from "@/db/queries/accounts";
import {
  digTableSpec,
  fieldTableSpec,
  listAccountPeople,
  listDigTable,
  listFieldTable,
} from "@/db/queries/tables";
import { can } from "@/lib/auth/permissions";
import { requirePageUser } from "@/lib/auth/session";
import { stageOfCollars } from "@/lib/digs/assessment";
import { isRecordId } from "@/lib/records/schemas";
import { parseTableQuery } from "@/lib/tables/params";
import { PlainHeader, TableShell } from "../../_components/data-table";

export const metadata: Metadata = { title: "Account" };

export default async function AccountPage({ params }: { params: Promise<{ accountId: string }> }) {
  const user = await requirePageUser();
  const { accountId } = await params;
  if (!isRecordId(accountId)) notFound();
  const [account, access] = await Promise.all([findAccount(accountId), findAccountAccess(user, accountId)]);
  if (!account || !access || !can(user, "read", { kind: "account", access })) notFound();

  const t = await getTranslations("office.account");
  const tf = await getTranslations("office.fields");
  const td = await getTranslations("office.digs");
  const tc = await getTranslations("office.common");
  const format = await getFormatter();
  const [people, fields, digs] = await Promise.all([
    listAccountPeople(accountId),
    listFieldTable(user, parseTableQuery({ accountId, pageSize: "100" }, fieldTableSpec)),
    listDigTable(user, parseTableQuery({ accountId }, { ...digTableSpec, pageSizes: [10] })),
  ]);

  return (
    <article aria-labelledby="account-heading" className="space-y-6">
      <header className="space-y-1">
        {user.role !== "grower" ? (
          <Link className="underline" href="/accounts">
            {t("backToAccounts")}
          </Link>
        ) : null}
        <h1 id="account-heading">{t("title", { name: account.name })}</h1>
        <p className="text-soil-700">
          {account.locality ? `${t("locality", { name: account.locality })} · ` : ""}
          {t("region", { name: account.regionName })}
        </p>
      </header>

      <div className="grid gap-4 sm:grid-cols-2">
        <section className="card" aria-labelledby="account-reps">
          <h2 id="account-reps">{t("reps")}</h2>
          <p>{people.reps.length ? people.reps.map((p) => p.name).join(", ") : t("nobody")}</p>
        </section>
        <section className="card" aria-labelledby="account-growers">
          <h2 id="account-growers">{t("growers")}</h2>
          <p>{people.growers.length ? people.growers.map((p) => p.name).join(", ") : t("nobody")}</p>
        </section>
      </div>

      <section aria-labelledby="account-fields" className="space-y-2">
        <h2 id="account-fields">{t("fields")}</h2>
        <TableShell
          caption={t("fields")}
          captionHidden
          isEmpty={fields.rows.length === 0}
          empty={<p>{tf("empty")}</p>}
        >
          <thead className="bg-soil-100">
            <tr>
              <PlainHeader label={tf("col.name")} />
              <PlainHeader label={tf("col.area")} align="right" />
              <PlainHeader label={tf("col.hybrids")} />
              <PlainHeader label={tf("col.digs")} align="right" />
              <PlainHeader label={tf("col.lastRootIndex")} align="right" />
            </tr>
          </thead>
          <tbody>
            {fields.rows.map((r) => (
              <tr key={r.id} className="border-t border-soil-200">
                <th scope="row" className="p-3 font-semibold">
                  <Link className="underline" href={`/fields/${r.id}`}>
                    {r.name}
                  </Link>
                </th>
                <td className="p-3 text-right tabular-nums">
                  {r.areaAcres === null
                    ? tc("none")
                    : tc("acres", { value: format.number(r.areaAcres, { maximumFractionDigits: 1 }) })}
                </td>
                <td className="p-3">{r.hybrids.join(", ") || tc("none")}</td>
                <td className="p-3 text-right tabular-nums">{r.digCount}</td>
                <td className="p-3 text-right tabular-nums">
                  {r.lastRootIndex === null
                    ? tc("none")
                    : format.number(r.lastRootIndex, { maximumFractionDigits: 1 })}
                </td>
              </tr>
            ))}
          </tbody>
        </TableShell>
        {fields.total > fields.rows.length ? (
          <Link className="underline" href={`/fields?accountId=${accountId}`}>
            {t("allFields")}
          </Link>
        ) : null}
      </section>

      <section aria-labelledby="account-digs" className="space-y-2">
        <h2 id="account-digs">{t("digs")}</h2>
        <TableShell
          caption={t("digs")}
          captionHidden
          isEmpty={digs.rows.length === 0}
          empty={<p>{td("empty")}</p>}
        >
          <thead className="bg-soil-100">
            <tr>
              <PlainHeader label={td("col.date")} />
              <PlainHeader label={td("col.field")} />
              <PlainHeader label={td("col.hybrid")} />
              <PlainHeader label={td("col.stage")} />
              <PlainHeader label={td("col.rootIndex")} align="right" />
              <PlainHeader label={td("col.flags")} />
            </tr>
          </thead>
          <tbody>
            {digs.rows.map((r) => (
              <tr key={r.id} className="border-t border-soil-200">
                <th scope="row" className="p-3 font-semibold">
                  <Link className="underline" href={`/digs/${r.id}`}>
                    {format.dateTime(r.dugAt, { dateStyle: "medium", timeStyle: "short" })}
                  </Link>
                </th>
                <td className="p-3">{r.fieldName}</td>
                <td className="p-3">{r.hybrid ?? tc("none")}</td>
                <td className="p-3">{r.leafCollars === null ? tc("none") : stageOfCollars(r.leafCollars)}</td>
                <td className="p-3 text-right tabular-nums">
                  {r.rootIndex === null
                    ? tc("none")
                    : format.number(r.rootIndex, { maximumFractionDigits: 1 })}
                </td>
                <td className="p-3">{tc("flagCount", { count: r.flagCount })}</td>
              </tr>
            ))}
          </tbody>
        </TableShell>
        <Link className="underline" href={`/digs?accountId=${accountId}`}>
          {t("allDigs")}
        </Link>
      </section>
    </article>
  );
}
