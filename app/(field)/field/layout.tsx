import Link from "next/link";
import { getTranslations } from "next-intl/server";
import { OnlineStatus } from "@/app/_components/online-status";
import { ServiceWorkerRegistration } from "@/app/_components/service-worker-registration";
import { requirePageUser } from "@/lib/auth/session";

// The field app: phone-first, one hand, high contrast for sunlight, usable offline once loaded.
export default async function FieldLayout({ children }: { children: React.ReactNode }) {
  await requirePageUser(["rep", "supervisor", "admin"]);
  const t = await getTranslations("field");
  return (
    <div className="flex min-h-dvh flex-col bg-white">
      <header className="sticky top-0 z-30 flex items-center gap-3 bg-sprout-900 px-gutter py-2 text-white">
        <span className="text-lg font-bold">{t("title")}</span>
        <OnlineStatus />
      </header>
      <main id="main" className="mx-auto w-full max-w-2xl flex-1 px-gutter pt-4 pb-28">
        {children}
      </main>
      <nav
        aria-label={t("nav.label")}
        className="fixed inset-x-0 bottom-0 z-30 border-t-2 border-soil-200 bg-white pb-[env(safe-area-inset-bottom)]"
      >
        <ul className="mx-auto flex max-w-2xl">
          <li className="flex-1">
            <Link
              href="/field/calculator"
              className="flex min-h-16 items-center justify-center font-bold text-sprout-900"
            >
              {t("nav.calculator")}
            </Link>
          </li>
          <li className="flex-1">
            <Link href="/" className="flex min-h-16 items-center justify-center font-bold text-soil-900">
              {t("nav.office")}
            </Link>
          </li>
        </ul>
      </nav>
      <ServiceWorkerRegistration />
    </div>
  );
}
