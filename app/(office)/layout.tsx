import Link from "next/link";
import { getTranslations } from "next-intl/server";
import { requirePageUser } from "@/lib/auth/session";
import { SignOutButton } from "./_components/sign-out-button";

export default async function OfficeLayout({ children }: { children: React.ReactNode }) {
  const user = await requirePageUser();
  const t = await getTranslations("common");
  return (
    <div className="min-h-dvh">
      <header className="bg-sprout-900 text-white">
        <div className="mx-auto flex max-w-6xl flex-wrap items-center gap-x-6 gap-y-2 px-gutter py-3">
          <Link href="/" className="text-xl font-bold">
            {t("appName")}
          </Link>
          <nav aria-label="Main" className="flex flex-1 flex-wrap gap-1">
            <Link href="/" className="rounded px-3 py-2 font-semibold hover:bg-sprout-700">
              {t("nav.home")}
            </Link>
            {user.role !== "grower" ? (
              <Link href="/field/calculator" className="rounded px-3 py-2 font-semibold hover:bg-sprout-700">
                {t("nav.calculator")}
              </Link>
            ) : null}
            {user.role === "admin" ? (
              <Link href="/admin/users" className="rounded px-3 py-2 font-semibold hover:bg-sprout-700">
                {t("nav.admin")}
              </Link>
            ) : null}
          </nav>
          <p className="text-sm">{t("nav.signedInAs", { name: user.name, role: t(`roles.${user.role}`) })}</p>
          <SignOutButton label={t("nav.signOut")} />
        </div>
      </header>
      <main id="main" className="mx-auto max-w-6xl p-gutter">
        {children}
      </main>
    </div>
  );
}
