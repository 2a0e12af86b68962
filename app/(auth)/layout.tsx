import { getTranslations } from "next-intl/server";
import { ScopedMessages } from "@/app/_components/scoped-messages";

export default async function AuthLayout({ children }: { children: React.ReactNode }) {
  const t = await getTranslations("common");
  return (
    <main id="main" className="mx-auto flex min-h-dvh max-w-md flex-col justify-center p-gutter">
      <p className="mb-6 text-center">
        <span className="block text-3xl font-bold text-sprout-700">{t("appName")}</span>
        <span className="text-sm text-soil-700">{t("tagline")}</span>
      </p>
      <div className="card">
        <ScopedMessages namespaces={["auth"]}>{children}</ScopedMessages>
      </div>
    </main>
  );
}
