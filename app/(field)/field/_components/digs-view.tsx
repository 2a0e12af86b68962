"use client";

import Link from "next/link";
import { useTranslations } from "next-intl";
import { DigList } from "./dig-list";
import { ReadingPlaceholder } from "./reading-placeholder";
import { StorageBoundary } from "./storage-boundary";
import { useLocalDigs } from "./use-local-digs";

// Every dig on this phone, newest first, with where each one stands with the server.
export function DigsView() {
  return (
    <StorageBoundary>
      <AllDigs />
    </StorageBoundary>
  );
}

function AllDigs() {
  const t = useTranslations("field");
  const digs = useLocalDigs();
  if (digs === undefined) return <ReadingPlaceholder />;
  if (digs.length === 0) {
    return (
      <div className="card">
        <p className="font-bold">{t("digs.empty")}</p>
        <p className="mt-1">{t("digs.emptyHint")}</p>
        <Link href="/field/digs/new" className="btn-primary mt-3">
          {t("nav.newDig")}
        </Link>
      </div>
    );
  }
  return <DigList digs={digs} />;
}
