"use client";

import { useLiveQuery } from "dexie-react-hooks";
import Link from "next/link";
import { useFormatter, useTranslations } from "next-intl";
import { fieldDb } from "@/sync/client/db";
import { syncStatus } from "@/sync/client/pull";
import { DigList } from "./dig-list";
import { type FieldOutlook, loadFieldOutlooks } from "./field-outlook";
import { FieldOutlookCard } from "./field-outlook-card";
import { ReadingPlaceholder } from "./reading-placeholder";
import { StorageBoundary } from "./storage-boundary";
import { SyncPanel } from "./sync-panel";
import { type DigListEntry, useLocalDigs } from "./use-local-digs";
import { useToday } from "./use-today";

const RECENT_DIGS = 5;

// Today, read from this phone's database so it works with no signal: what is waiting to sync, the
// rep's fields with their stage and dig window, and the latest digs.
export function TodayView() {
  return (
    <StorageBoundary>
      <TodayContent />
    </StorageBoundary>
  );
}

function TodayContent() {
  const today = useToday();
  const outlooks = useLiveQuery(() => loadFieldOutlooks(fieldDb(), today), [today]);
  const digs = useLocalDigs(RECENT_DIGS);
  const status = useLiveQuery(() => syncStatus(fieldDb()), []);
  // Everything appears at once, so nothing the rep is reading moves as the reads finish.
  if (outlooks === undefined || digs === undefined || status === undefined) return <ReadingPlaceholder />;
  return (
    <div className="flex flex-col gap-6">
      <SyncPanel status={status} />
      <FieldsToday today={today} outlooks={outlooks} />
      <RecentDigs digs={digs} />
    </div>
  );
}

function FieldsToday({ today, outlooks }: { today: string; outlooks: FieldOutlook[] }) {
  const t = useTranslations("field.today");
  const format = useFormatter();
  return (
    <section aria-labelledby="fields-heading">
      <h2 id="fields-heading">{t("fieldsHeading")}</h2>
      <p className="text-soil-700">
        {format.dateTime(new Date(`${today}T12:00:00Z`), {
          weekday: "long",
          month: "long",
          day: "numeric",
          timeZone: "UTC",
        })}
        {" · "}
        {t("fieldsIntro")}
      </p>
      {outlooks.length === 0 ? (
        <div className="notice-caution mt-3">
          <p className="font-bold">{t("noFields")}</p>
          <p className="mt-1">{t("noFieldsHint")}</p>
        </div>
      ) : (
        <ul className="mt-3 flex flex-col gap-3">
          {outlooks.map((o) => (
            <FieldOutlookCard key={o.field.id} outlook={o} />
          ))}
        </ul>
      )}
    </section>
  );
}

function RecentDigs({ digs }: { digs: DigListEntry[] }) {
  const t = useTranslations("field");
  return (
    <section aria-labelledby="recent-heading">
      <div className="flex flex-wrap items-center justify-between gap-3">
        <h2 id="recent-heading">{t("today.recentHeading")}</h2>
        <Link href="/field/digs/new" className="btn-primary">
          {t("today.newDig")}
        </Link>
      </div>
      {digs.length === 0 ? (
        <div className="card mt-3">
          <p className="font-bold">{t("digs.empty")}</p>
          <p className="mt-1">{t("digs.emptyHint")}</p>
        </div>
      ) : (
        <>
          <div className="mt-3">
            <DigList digs={digs} />
          </div>
          <Link href="/field/digs" className="btn-secondary mt-3 w-full">
            {t("today.allDigs")}
          </Link>
        </>
      )}
    </section>
  );
}
