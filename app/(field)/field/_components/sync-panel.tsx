"use client";

import { useFormatter, useNow, useTranslations } from "next-intl";
import { useCallback, useEffect, useRef, useState } from "react";
import { fieldDb } from "@/sync/client/db";
import { pullNow, type SyncErrorInfo, type SyncErrorKind, type SyncStatus } from "@/sync/client/pull";
import { useOnline } from "./use-online";

const ERROR_KEY: Record<SyncErrorKind, string> = {
  "signed-out": "signedOut",
  "unsupported-version": "version",
  offline: "offline",
  server: "server",
  storage: "storage",
  other: "other",
};

type Run =
  | { state: "idle" }
  | { state: "running" }
  | { state: "done" }
  | { state: "failed"; message: string };

// What is waiting to sync, the last successful sync, the last failure in plain words, and a
// "Refresh data" button that downloads the rep's fields and records. A phone that has never pulled
// pulls once on its own as soon as it is online.
export function SyncPanel({ status }: { status: SyncStatus }) {
  const t = useTranslations("field.sync");
  const format = useFormatter();
  const now = useNow({ updateInterval: 30_000 });
  const online = useOnline();
  const [run, setRun] = useState<Run>({ state: "idle" });
  const running = useRef(false);

  const refresh = useCallback(async () => {
    if (running.current) return;
    running.current = true;
    setRun({ state: "running" });
    try {
      await pullNow(fieldDb());
      setRun({ state: "done" });
    } catch (err) {
      // pullNow has recorded the failure for the status line; this keeps it visible even if that
      // record could not be written.
      console.error("Refresh failed", err);
      setRun({ state: "failed", message: err instanceof Error ? err.message : String(err) });
    } finally {
      running.current = false;
    }
  }, []);

  // Once the page has settled, so the download does not hold up the first taps.
  const firstPullTried = useRef(false);
  const neverPulled = status.lastPullAt === null;
  useEffect(() => {
    if (firstPullTried.current || !online || !neverPulled) return;
    const start = () => {
      firstPullTried.current = true;
      void refresh();
    };
    // requestIdleCallback is missing on older Safari.
    if (typeof window.requestIdleCallback === "function") {
      const handle = window.requestIdleCallback(start, { timeout: 2000 });
      return () => window.cancelIdleCallback(handle);
    }
    const timer = setTimeout(start, 200);
    return () => clearTimeout(timer);
  }, [online, neverPulled, refresh]);

  // The clock ticks every 30 s; a sync that finished since then is "now", never "in 2 seconds".
  const ago = (at: Date) => format.relativeTime(at, new Date(Math.max(now.getTime(), at.getTime())));
  const errorText = (error: SyncErrorInfo) =>
    t(`errors.${ERROR_KEY[error.kind]}` as "errors.other", { message: error.message });

  return (
    <section aria-labelledby="sync-heading" className="card" aria-busy={run.state === "running"}>
      <h2 id="sync-heading">{t("heading")}</h2>
      <p className="mt-2 font-semibold">
        {status.pendingMutations === 0 && status.pendingPhotos === 0
          ? t("nothingWaiting")
          : t("waiting", { records: status.pendingMutations, photos: status.pendingPhotos })}
      </p>
      <p className="mt-1">
        {status.lastPullAt ? t("lastSync", { when: ago(new Date(status.lastPullAt)) }) : t("neverSynced")}
      </p>
      {status.lastError && run.state !== "running" ? (
        <div className="notice-error mt-2">
          <p>{t("lastError", { reason: errorText(status.lastError) })}</p>
          {status.lastError.kind === "signed-out" && online ? (
            // A full page load: the sign-in page is not one of the field app's stored pages.
            <a href="/sign-in" className="btn-secondary mt-2">
              {t("signIn")}
            </a>
          ) : null}
        </div>
      ) : run.state === "failed" ? (
        <p className="notice-error mt-2">{t("lastError", { reason: run.message })}</p>
      ) : null}
      <div className="mt-3 flex flex-wrap items-center gap-3">
        <button
          type="button"
          className="btn-primary"
          disabled={!online || run.state === "running"}
          onClick={() => void refresh()}
        >
          {t("refresh")}
        </button>
        <p role="status" className="min-h-[1.65rem] flex-1 basis-48">
          {run.state === "running" ? t("refreshing") : run.state === "done" ? t("refreshed") : ""}
        </p>
      </div>
      {online ? null : <p className="mt-2 text-soil-700">{t("offlineHint")}</p>}
    </section>
  );
}
