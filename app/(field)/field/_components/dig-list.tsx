"use client";

import Link from "next/link";
import { useFormatter, useTranslations } from "next-intl";
import { SyncStateBadge } from "./sync-state-badge";
import type { DigListEntry } from "./use-local-digs";

// Where a dig opens: its page in the dig form.
export function digHref(id: string): string {
  return `/field/digs/edit?id=${encodeURIComponent(id)}`;
}

const deviceTimeZone = () => Intl.DateTimeFormat().resolvedOptions().timeZone;

export function DigList({ digs }: { digs: DigListEntry[] }) {
  const t = useTranslations("field.digs");
  const format = useFormatter();
  const timeZone = deviceTimeZone();
  return (
    <ul className="flex flex-col gap-3">
      {digs.map((d) => (
        <li key={d.site.id}>
          <Link
            href={digHref(d.site.id)}
            className="card block hover:border-soil-500 focus-visible:border-soil-500"
          >
            <span className="flex flex-wrap items-baseline justify-between gap-x-3">
              <span className="text-lg font-bold">{d.fieldName ?? t("unknownField")}</span>
              <time dateTime={d.site.dugAt} className="text-soil-700">
                {format.dateTime(new Date(d.site.dugAt), {
                  dateStyle: "medium",
                  timeStyle: "short",
                  timeZone,
                })}
              </time>
            </span>
            <span className="mt-1 block">
              {t("plants", { count: d.plantCount })} · {t("photos", { count: d.photoCount })}
            </span>
            <span className="mt-2 block">
              <SyncStateBadge state={d.display} />
            </span>
            {d.display === "rejected" ? (
              <span className="mt-1 block text-sm font-semibold text-burn-700">
                {d.reason ? t("rejectedReason", { reason: d.reason }) : t("rejectedNoReason")}
              </span>
            ) : null}
            {d.display === "conflict" ? (
              <span className="mt-1 block text-sm text-soil-700">{t("conflictHint")}</span>
            ) : null}
          </Link>
        </li>
      ))}
    </ul>
  );
}
