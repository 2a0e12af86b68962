import type { Metadata } from "next";
import { getTranslations } from "next-intl/server";

export const metadata: Metadata = { title: "Offline" };

// What the service worker shows for a field page this phone has never stored (it was first opened
// with no signal), instead of the browser's own error page.
export default async function OfflineFallbackPage() {
  const t = await getTranslations("field");
  // Plain links: a full page load is answered by the service worker from what this phone stores.
  const links = [
    { href: "/field", label: t("nav.today") },
    { href: "/field/digs", label: t("nav.digs") },
    { href: "/field/calculator", label: t("nav.calculator") },
  ];
  return (
    <>
      <h1>{t("offlinePage.title")}</h1>
      <p className="mt-2">{t("offlinePage.body")}</p>
      <p className="mt-4 font-semibold">{t("offlinePage.available")}</p>
      <ul className="mt-2 flex flex-col gap-2">
        {links.map((l) => (
          <li key={l.href}>
            <a href={l.href} className="btn-secondary w-full">
              {l.label}
            </a>
          </li>
        ))}
      </ul>
    </>
  );
}
