import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { getTranslations } from "next-intl/server";
import { findAdminAccount, listAssignableUsers } from "@/db/queries/admin-accounts";
import { listRegionOptions } from "@/db/queries/regions";
import { idSchema } from "@/lib/admin/schemas";
import { requirePageUser } from "@/lib/auth/session";
import { EditAccountForm } from "../_components/account-forms";
import { MemberSection } from "../_components/member-section";

type Params = Promise<{ id: string }>;

async function load(rawId: string) {
  const id = idSchema.safeParse(rawId);
  return id.success ? findAdminAccount(id.data) : undefined;
}

export async function generateMetadata({ params }: { params: Params }): Promise<Metadata> {
  const account = await load((await params).id);
  const t = await getTranslations("admin.accounts");
  return { title: account?.name ?? t("title") };
}

export default async function AdminAccountPage({ params }: { params: Params }) {
  await requirePageUser(["admin"]);
  const account = await load((await params).id);
  if (!account) notFound();
  const [regions, reps, growers] = await Promise.all([
    listRegionOptions(),
    listAssignableUsers(account.id, "rep"),
    listAssignableUsers(account.id, "grower"),
  ]);
  const t = await getTranslations("admin.accounts");

  return (
    <section aria-labelledby="account-heading" className="space-y-5">
      <p>
        <Link
          href="/admin/accounts"
          className="inline-flex min-h-tap items-center font-semibold text-water-700 underline"
        >
          {t("back")}
        </Link>
      </p>
      <div>
        <h1 id="account-heading">{account.name}</h1>
        <p className="text-soil-700">
          {account.locality ? `${account.regionName} · ${account.locality}` : account.regionName} ·{" "}
          {t("fieldCount", { count: account.fieldCount })}
        </p>
      </div>
      <div className="grid gap-5 lg:grid-cols-2">
        <MemberSection
          accountId={account.id}
          regionId={account.regionId}
          kind="rep"
          members={account.reps}
          candidates={reps}
        />
        <MemberSection
          accountId={account.id}
          regionId={account.regionId}
          kind="grower"
          members={account.growers}
          candidates={growers}
        />
      </div>
      <EditAccountForm
        account={{
          id: account.id,
          name: account.name,
          locality: account.locality,
          regionId: account.regionId,
        }}
        regions={regions}
      />
    </section>
  );
}
