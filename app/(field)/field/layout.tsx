import type { Metadata, Viewport } from "next";
import Link from "next/link";
import { getTranslations } from "next-intl/server";
import { OnlineStatus } from "@/app/_components/online-status";
import { ServiceWorkerRegistration } from "@/app/_components/service-worker-registration";
import { requirePageUser } from "@/lib/auth/session";
import { FieldNav } from "./_components/field-nav";
import { PersistWarning, StorageAlert } from "./_components/storage-status";
import { SyncStatusBar } from "./_components/sync-status-bar";

export const metadata: Metadata = {
  icons: { apple: "/icons/apple-touch-icon.png" },
  appleWebApp: { capable: true, statusBarStyle: "default" },
};

// sprout-900, the header's colour, so an installed app's status bar runs into it.
export const viewport: Viewport = { themeColor: "#143a1c" };

// The field app: phone-first, one hand, high contrast for sunlight, usable offline once loaded.
export default async function FieldLayout({ children }: { children: React.ReactNode }) {
  await requirePageUser(["rep", "supervisor", "admin"]);
  const t = await getTranslations("field");
  return (
    <div className="flex min-h-dvh flex-col bg-white">
      <header className="sticky top-0 z-30 flex items-center gap-3 bg-sprout-900 px-gutter py-2 text-white">
        <span className="text-lg font-bold">{t("title")}</span>
        <OnlineStatus />
        <Link
          href="/"
          className="ml-auto flex min-h-tap items-center rounded px-3 font-semibold underline underline-offset-4 hover:bg-sprout-700"
        >
          {t("nav.office")}
        </Link>
      </header>
      <SyncStatusBar />
      <StorageAlert />
      <main id="main" className="mx-auto w-full max-w-2xl flex-1 px-gutter pt-4 pb-28">
        {children}
        <PersistWarning />
      </main>
      <FieldNav />
      <ServiceWorkerRegistration />
    </div>
  );
}
