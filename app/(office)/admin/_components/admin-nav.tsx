"use client";

import Link from "next/link";
import { usePathname } from "next/navigation";

export function AdminNav({ label, links }: { label: string; links: { href: string; label: string }[] }) {
  const pathname = usePathname();
  return (
    <nav aria-label={label} className="-mx-1 overflow-x-auto border-b-2 border-soil-200">
      <ul className="flex gap-1 px-1">
        {links.map((l) => {
          const current = pathname === l.href || pathname.startsWith(`${l.href}/`);
          return (
            <li key={l.href}>
              <Link
                href={l.href}
                aria-current={current ? "page" : undefined}
                className={`-mb-0.5 inline-flex min-h-tap items-center border-b-4 px-4 font-semibold hover:bg-soil-100 ${
                  current ? "border-sprout-700 text-sprout-900" : "border-transparent text-soil-700"
                }`}
              >
                {l.label}
              </Link>
            </li>
          );
        })}
      </ul>
    </nav>
  );
}
