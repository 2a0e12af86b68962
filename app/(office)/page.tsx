import type { Metadata } from "next";
import Link from "next/link";
import { getTranslations } from "next-intl/server";
import { type AccountSummary, listAccountSummaries } from "@/db/queries/accounts";
import { countUsersByStatus } from "@/db/queries/admin-users";
import { requirePageUser } from "@/lib/auth/session";
import { GrowerHome } from "./_components/grower-home";

export const metadata: Metadata = { title: "Home" };

export default async function HomePage() {
  const user = await requirePageUser();
  const t = await getTranslations("home");

  if (user.role === "admin") {
    const counts = await countUsersByStatus();
    return (
      <section aria-labelledby="home-heading" className="space-y-4">
        <h1 id="home-heading">{t("admin.heading")}</h1>
        <p className="text-soil-700">{t("admin.intro")}</p>
        <ul className="flex flex-wrap gap-4">
          <li className="card">{t("admin.users", { count: counts.active })}</li>
          <li className="card">{t("admin.invited", { count: counts.invited })}</li>
        </ul>
        <nav aria-label="Administration" className="flex flex-wrap gap-3">
          <Link className="btn-primary" href="/admin/users">
            {t("admin.manageUsers")}
          </Link>
          <Link className="btn-secondary" href="/admin/regions">
            {t("admin.manageRegions")}
          </Link>
          <Link className="btn-secondary" href="/admin/accounts">
            {t("admin.manageAccounts")}
          </Link>
        </nav>
      </section>
    );
  }

  if (user.role === "grower") return <GrowerHome user={user} />;

  const accounts = await listAccountSummaries(user);
  const role = user.role;
  return (
    <section aria-labelledby="home-heading" className="space-y-4">
      <h1 id="home-heading">{t(`${role}.heading`)}</h1>
      <p className="text-soil-700">{t(`${role}.intro`)}</p>
      {accounts.length === 0 ? (
        <p className="notice-caution">{t(`empty.${role}`)}</p>
      ) : role === "supervisor" ? (
        <RegionTable accounts={accounts} />
      ) : (
        <AccountCards accounts={accounts} showGrowers={role === "rep"} />
      )}
    </section>
  );
}

async function AccountCards({ accounts, showGrowers }: { accounts: AccountSummary[]; showGrowers: boolean }) {
  const t = await getTranslations("home.account");
  return (
    <ul className="grid gap-4 sm:grid-cols-2">
      {accounts.map((a) => (
        <li key={a.id} className="card">
          <h2>{a.name}</h2>
          {a.locality ? <p className="text-soil-700">{a.locality}</p> : null}
          <p className="mt-2">
            {t("fields", { count: a.fieldCount })} · {t("digs", { count: a.digCount })}
          </p>
          {showGrowers && a.growers.length ? (
            <p className="text-sm text-soil-700">{t("growers", { names: a.growers.join(", ") })}</p>
          ) : null}
          {!showGrowers && a.reps.length ? (
            <p className="text-sm text-soil-700">{t("reps", { names: a.reps.join(", ") })}</p>
          ) : null}
        </li>
      ))}
    </ul>
  );
}

async function RegionTable({ accounts }: { accounts: AccountSummary[] }) {
  const t = await getTranslations("home.table");
  return (
    <section
      className="overflow-x-auto rounded-card border border-soil-200 bg-white"
      aria-label={t("account")}
      // biome-ignore lint/a11y/noNoninteractiveTabindex: a scrollable table must be reachable by keyboard
      tabIndex={0}
    >
      <table className="w-full text-left">
        <thead className="bg-soil-100">
          <tr>
            <th scope="col" className="p-3">
              {t("account")}
            </th>
            <th scope="col" className="p-3">
              {t("locality")}
            </th>
            <th scope="col" className="p-3">
              {t("reps")}
            </th>
            <th scope="col" className="p-3 text-right">
              {t("fields")}
            </th>
            <th scope="col" className="p-3 text-right">
              {t("digs")}
            </th>
          </tr>
        </thead>
        <tbody>
          {accounts.map((a) => (
            <tr key={a.id} className="border-t border-soil-200">
              <th scope="row" className="p-3 font-semibold">
                {a.name}
              </th>
              <td className="p-3">{a.locality}</td>
              <td className="p-3">{a.reps.join(", ")}</td>
              <td className="p-3 text-right">{a.fieldCount}</td>
              <td className="p-3 text-right">{a.digCount}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </section>
  );
}
