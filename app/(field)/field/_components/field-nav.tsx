"use client";

import Link from "next/link";
import { usePathname } from "next/navigation";
import { useTranslations } from "next-intl";

type Item = { href: string; key: "today" | "newDig" | "digs" | "calculator"; icon: React.ReactNode };

const stroke = {
  fill: "none",
  stroke: "currentColor",
  strokeWidth: 2.25,
  strokeLinecap: "round",
  strokeLinejoin: "round",
} as const;

const ITEMS: Item[] = [
  {
    href: "/field",
    key: "today",
    icon: (
      <>
        <circle cx="12" cy="12" r="4" {...stroke} />
        <path
          d="M12 2v3M12 19v3M2 12h3M19 12h3M4.9 4.9l2.1 2.1M17 17l2.1 2.1M4.9 19.1 7 17M17 7l2.1-2.1"
          {...stroke}
        />
      </>
    ),
  },
  {
    href: "/field/digs/new",
    key: "newDig",
    icon: (
      <>
        <circle cx="12" cy="12" r="9" {...stroke} />
        <path d="M12 7.5v9M7.5 12h9" {...stroke} />
      </>
    ),
  },
  {
    href: "/field/digs",
    key: "digs",
    icon: <path d="M8 6h12M8 12h12M8 18h12M4 6h.01M4 12h.01M4 18h.01" {...stroke} />,
  },
  {
    href: "/field/calculator",
    key: "calculator",
    icon: (
      <>
        <rect x="5" y="2.5" width="14" height="19" rx="2" {...stroke} />
        <path
          d="M8.5 6.5h7M8.5 11h.01M12 11h.01M15.5 11h.01M8.5 14.5h.01M12 14.5h.01M15.5 14.5h.01M8.5 18h.01M12 18h.01M15.5 18h.01"
          {...stroke}
        />
      </>
    ),
  },
];

function isCurrent(pathname: string, href: string): boolean {
  if (href === "/field") return pathname === "/field";
  if (href === "/field/digs")
    return pathname.startsWith("/field/digs") && !pathname.startsWith("/field/digs/new");
  return pathname.startsWith(href);
}

// The bottom bar: four large targets within a thumb's reach, icon and word together.
export function FieldNav() {
  const t = useTranslations("field.nav");
  const pathname = usePathname();
  return (
    <nav
      aria-label={t("label")}
      className="fixed inset-x-0 bottom-0 z-30 border-t-2 border-soil-200 bg-white pb-[env(safe-area-inset-bottom)]"
    >
      <ul className="mx-auto grid max-w-2xl grid-cols-4">
        {ITEMS.map((item) => {
          const current = isCurrent(pathname, item.href);
          return (
            <li key={item.href}>
              <Link
                href={item.href}
                aria-current={current ? "page" : undefined}
                className={`flex min-h-16 flex-col items-center justify-center gap-0.5 px-1 text-sm font-bold ${
                  current
                    ? "bg-sprout-50 text-sprout-900 underline decoration-4 underline-offset-4"
                    : "text-soil-900"
                }`}
              >
                <svg viewBox="0 0 24 24" width="26" height="26" aria-hidden="true">
                  {item.icon}
                </svg>
                {t(item.key)}
              </Link>
            </li>
          );
        })}
      </ul>
    </nav>
  );
}
