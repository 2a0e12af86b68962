import Link from "next/link";
import { getTranslations } from "next-intl/server";
import { requirePageUser } from "@/lib/auth/session";
import { ScopedMessages } from "@/app/_components/scoped-messages";
import { SignOutButton } from "./_components/sign-out-button";

export default async function OfficeLayout({ children }: { children: React.ReactNode }) {
  const user = await requirePageUser();
  const t = await getTranslations("common");
  return (
    <div className="min-h-dvh">
      <header className="bg-sprout-900 text-white">
        {/* Phones: name and sign-out on top, the menu below; wider screens: one row. */}
        <div className="mx-auto flex max-w-6xl flex-wrap items-center gap-x-6 gap-y-1 px-gutter py-2 md:py-3">
          <Link href="/" className="mr-auto text-xl font-bold md:mr-0">
            {t("appName")}
          </Link>
          <nav
            aria-label="Main"
            className="order-3 -mx-3 flex w-full gap-1 overflow-x-auto md:order-none md:mx-0 md:w-auto md:flex-1"
          >
            <Link href="/" className="shrink-0 rounded px-3 py-2 font-semibold hover:bg-sprout-700">
              {t("nav.home")}
            </Link>
            {user.role !== "grower" ? (
              <Link
                href="/field/calculator"
                className="shrink-0 rounded px-3 py-2 font-semibold hover:bg-sprout-700"
              >
                {t("nav.calculator")}
              </Link>
            ) : null}
            {user.role === "admin" ? (
              <Link
                href="/admin/users"
                className="shrink-0 rounded px-3 py-2 font-semibold hover:bg-sprout-700"
              >
                {t("nav.admin")}
              </Link>
            ) : null}
          </nav>
          <p className="order-4 w-full text-xs text-sprout-100 md:order-none md:w-auto md:text-sm">
            {t("nav.signedInAs", { name: user.name, role: t(`roles.${user.role}`) })}
          </p>
          <SignOutButton label={t("nav.signOut")} />
        </div>
      </header>
      <main id="main" className="mx-auto max-w-6xl p-gutter">
        <ScopedMessages namespaces={["auth", "admin", "home", "products"]}>{children}</ScopedMessages>
      </main>
    </div>
  );
}
