import Link from "next/link";
import { getTranslations } from "next-intl/server";
import { requirePageUser } from "@/lib/auth/session";
import { ScopedMessages } from "@/app/_components/scoped-messages";
import { SignOutButton } from "./_components/sign-out-button";

export default async function OfficeLayout({ children }: { children: React.ReactNode }) {
  const user = await requirePageUser();
  const t = await getTranslations("common");
  const role = user.role;
  // One menu for every role; each page re-checks access itself.
  const links = [
    { href: "/", label: "home" },
    { href: "/map", label: "map" },
    ...(role === "admin" || role === "supervisor" || role === "rep"
      ? [{ href: "/accounts", label: "accounts" }]
      : []),
    { href: "/fields", label: "fields" },
    { href: "/digs", label: "digs" },
    ...(role === "grower" ? [] : [{ href: "/cases", label: "cases" }]),
    { href: "/reports", label: "reports" },
    ...(role === "grower" ? [] : [{ href: "/field/calculator", label: "calculator" }]),
    ...(role === "admin" ? [{ href: "/admin/users", label: "admin" }] : []),
  ] as const;
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
            {links.map((link) => (
              <Link
                key={link.href}
                href={link.href}
                className="shrink-0 rounded px-3 py-2 font-semibold hover:bg-sprout-700"
              >
                {t(`nav.${link.label}`)}
              </Link>
            ))}
          </nav>
          <p className="order-4 w-full text-xs text-sprout-100 md:order-none md:w-auto md:text-sm">
            {t("nav.signedInAs", { name: user.name, role: t(`roles.${user.role}`) })}
          </p>
          <SignOutButton label={t("nav.signOut")} />
        </div>
      </header>
      <main id="main" className="mx-auto max-w-6xl p-gutter">
        <ScopedMessages
          namespaces={[
            "auth",
            "admin",
            "home",
            "products",
            "office",
            "map",
            "fieldPage",
            "reports",
            "cases",
            "grower",
          ]}
        >
          {children}
        </ScopedMessages>
      </main>
    </div>
  );
}
