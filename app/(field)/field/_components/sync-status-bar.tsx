"use client";

import Link from "next/link";
import { useFormatter, useNow, useTranslations } from "next-intl";
import { useEffect, useRef, useState } from "react";
import type { SyncRunner, SyncRunnerStatus } from "@/sync/client/runner";

// Any part of the field app can ask for a sync now (after a save, say) without holding the runner.
const SYNC_NOW_EVENT = "trenchbook:sync-now";
export function requestSync() {
  window.dispatchEvent(new Event(SYNC_NOW_EVENT));
}

// Starts the page's one sync runner (sync/client/runner.ts) once the page is idle, so the first taps
// are not held up, and stops it when the field app is left.
function useSyncRunner() {
  const [status, setStatus] = useState<SyncRunnerStatus | null>(null);
  const [loadError, setLoadError] = useState<string | null>(null);
  const runner = useRef<SyncRunner | null>(null);

  useEffect(() => {
    let active = true;
    const start = () =>
      import("@/sync/client/runner").then(
        ({ startSyncRunner }) => {
          if (active) runner.current = startSyncRunner({ onStatus: setStatus });
        },
        (err: unknown) => {
          console.error("The sync code did not load", err);
          if (active) setLoadError(err instanceof Error ? err.message : String(err));
        },
      );
    const idle = typeof window.requestIdleCallback === "function";
    const handle = idle ? window.requestIdleCallback(start, { timeout: 2000 }) : setTimeout(start, 200);
    const onRequest = () => void runner.current?.syncNow();
    window.addEventListener(SYNC_NOW_EVENT, onRequest);
    return () => {
      active = false;
      if (idle) window.cancelIdleCallback(handle as number);
      else clearTimeout(handle);
      window.removeEventListener(SYNC_NOW_EVENT, onRequest);
      runner.current?.stop();
      runner.current = null;
    };
  }, []);

  return { status, loadError, syncNow: () => runner.current?.syncNow() };
}

// Always in view under the header: what is waiting, progress while sending, the last successful
// sync, "Sync now", and any failure in plain words with what to do about it.
export function SyncStatusBar() {
  const t = useTranslations("sync");
  const format = useFormatter();
  const now = useNow({ updateInterval: 30_000 });
  const { status, loadError, syncNow } = useSyncRunner();

  const busy = status !== null && status.phase !== "idle";
  const percent = status ? Math.round(status.progress * 100) : 0;
  // A sync that finished since the clock last ticked is "now", never "in 2 seconds".
  const ago = (iso: string) => {
    const at = new Date(iso);
    return format.relativeTime(at, new Date(Math.max(now.getTime(), at.getTime())));
  };
  const until = (iso: string) => {
    const at = new Date(iso);
    return format.relativeTime(at, new Date(Math.min(Date.now(), at.getTime())));
  };

  let line: string;
  if (!status) line = t("bar.checking");
  else if (status.phase === "uploading") line = t("bar.uploading", { percent });
  else if (status.phase === "pushing") line = t("bar.pushing", { percent });
  else if (status.phase === "pulling") line = t("bar.pulling");
  else if (status.pendingMutations === 0 && status.pendingPhotos === 0) line = t("bar.allSent");
  else line = t("bar.waiting", { records: status.pendingMutations, photos: status.pendingPhotos });

  return (
    <section
      aria-label={t("bar.label")}
      data-testid="sync-status-bar"
      data-phase={status?.phase ?? "starting"}
      className="sticky top-16 z-20 border-b-2 border-soil-200 bg-soil-50 px-gutter py-1.5 text-soil-900"
    >
      <div className="mx-auto flex max-w-2xl flex-wrap items-center gap-x-3 gap-y-1">
        <p aria-live="polite" className="min-w-0 flex-1 basis-52">
          <span className="font-bold">{line}</span>
          <span className="block text-sm text-soil-700">
            {status && !status.online
              ? t("bar.offline")
              : status?.lastSuccessAt
                ? t("bar.lastSync", { when: ago(status.lastSuccessAt) })
                : status
                  ? t("bar.neverSynced")
                  : "\u00a0"}
            {status?.otherTab ? ` · ${t("bar.otherTab")}` : null}
          </span>
        </p>
        <button
          type="button"
          className="btn-secondary min-h-tap"
          disabled={!status || busy || !status.online}
          onClick={() => void syncNow()}
        >
          {t("bar.syncNow")}
        </button>
      </div>
      {busy && status.phase !== "pulling" ? (
        <div
          role="progressbar"
          aria-label={t("bar.progress")}
          aria-valuemin={0}
          aria-valuemax={100}
          aria-valuenow={percent}
          className="mx-auto mt-1 h-2 max-w-2xl overflow-hidden rounded-full bg-soil-200"
        >
          <div className="h-full bg-sprout-700 transition-[width]" style={{ width: `${percent}%` }} />
        </div>
      ) : null}
      {loadError ? (
        <p role="alert" className="notice-error mx-auto mt-1 max-w-2xl">
          {t("errors.storage", { message: loadError })}
        </p>
      ) : status?.error ? (
        <SyncError status={status} retryAt={status.nextAttemptAt ? until(status.nextAttemptAt) : null} />
      ) : null}
    </section>
  );
}

function SyncError({ status, retryAt }: { status: SyncRunnerStatus; retryAt: string | null }) {
  const t = useTranslations("sync");
  const error = status.error!;
  const retry = retryAt && status.online ? ` ${t("bar.retry", { when: retryAt })}` : "";
  let body: React.ReactNode;
  switch (error.kind) {
    case "signedOut":
      body = (
        <>
          {t("errors.signedOut")}{" "}
          <Link href="/sign-in" className="font-bold underline underline-offset-4">
            {t("errors.signIn")}
          </Link>
        </>
      );
      break;
    case "version":
      body = (
        <>
          {t("errors.version")}{" "}
          <button
            type="button"
            className="font-bold underline underline-offset-4"
            onClick={() => window.location.reload()}
          >
            {t("errors.reload")}
          </button>
        </>
      );
      break;
    case "network":
      body = t("errors.network") + retry;
      break;
    case "server":
      body = t("errors.server", { message: error.message }) + retry;
      break;
    case "storage":
      body = t("errors.storage", { message: error.message });
      break;
    case "rejected": {
      const first = status.refused[0];
      body = first ? (
        <>
          {t("errors.rejected", { what: t(`errors.what.${first.table}`), reason: first.reason })}{" "}
          {status.refused.length > 1 ? `${t("errors.more", { count: status.refused.length - 1 })} ` : null}
          <Link
            href={`/field/digs/edit?id=${encodeURIComponent(first.digSiteId)}`}
            className="font-bold underline underline-offset-4"
          >
            {t("errors.open")}
          </Link>
        </>
      ) : (
        error.message
      );
      break;
    }
  }
  return (
    <p
      role="alert"
      data-error-kind={error.kind}
      className={`${error.kind === "rejected" || error.kind === "signedOut" ? "notice-error" : "notice-caution"} mx-auto mt-1 max-w-2xl`}
    >
      {body}
    </p>
  );
}
