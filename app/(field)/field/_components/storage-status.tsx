"use client";

import { useTranslations } from "next-intl";
import { useEffect, useState } from "react";
import {
  classifyStorageError,
  type PersistResult,
  requestPersistentStorage,
  type StorageErrorKind,
} from "@/sync/client/storage";

interface StorageFailure {
  kind: StorageErrorKind;
  message: string;
}

function failureOf(err: unknown): StorageFailure {
  return { kind: classifyStorageError(err), message: err instanceof Error ? err.message : String(err) };
}

// Opens the field app's database at start and reports, in plain words and across the whole width,
// when this phone cannot keep data: IndexedDB that will not open, or a full disk. Storage failures
// nobody handled elsewhere in the field app land here too.
export function StorageAlert() {
  const t = useTranslations("field.storage");
  const [failure, setFailure] = useState<StorageFailure | null>(null);

  useEffect(() => {
    let active = true;
    // Checked once the page is idle, so pages that never read the database (the calculator) are not
    // slowed down by it; pages that read it report their own failures at once (StorageBoundary).
    const check = () =>
      import("@/sync/client/db").then(
        ({ fieldDb }) =>
          fieldDb()
            .open()
            .catch((err: unknown) => {
              console.error("The field database did not open", err);
              if (active) setFailure(failureOf(err));
            }),
        (err: unknown) => console.error("The field database code did not load", err),
      );
    const idle = typeof window.requestIdleCallback === "function";
    const handle = idle ? window.requestIdleCallback(check, { timeout: 3000 }) : setTimeout(check, 500);
    const onRejection = (event: PromiseRejectionEvent) => {
      if (classifyStorageError(event.reason) !== "other") setFailure(failureOf(event.reason));
    };
    window.addEventListener("unhandledrejection", onRejection);
    return () => {
      active = false;
      if (idle) window.cancelIdleCallback(handle as number);
      else clearTimeout(handle);
      window.removeEventListener("unhandledrejection", onRejection);
    };
  }, []);

  if (!failure) return null;
  const [title, body] =
    failure.kind === "unavailable"
      ? [t("unavailableTitle"), t("unavailableBody")]
      : failure.kind === "quota"
        ? [t("quotaTitle"), t("quotaBody")]
        : [t("otherTitle"), t("otherBody", { message: failure.message })];
  return (
    <div role="alert" className="border-y-4 border-burn-700 bg-burn-50 px-gutter py-4 text-soil-900">
      <div className="mx-auto max-w-2xl">
        <h2 className="text-lg font-bold">{title}</h2>
        <p className="mt-1">{body}</p>
        {failure.kind === "unavailable" ? (
          <p className="mt-2 font-semibold">{t("unavailableSteps")}</p>
        ) : null}
        <button type="button" className="btn-secondary mt-3" onClick={() => window.location.reload()}>
          {t("reload")}
        </button>
      </div>
    </div>
  );
}

// Asked once per page load, however often the layout re-renders.
let persistRequest: Promise<PersistResult> | null = null;
const DISMISSED = "trenchbook.persist-warning-dismissed";

// Asks the browser to keep this phone's records (not to evict them when space runs low) and says
// so plainly when it will not. Shown after the page's content, so nothing the rep reads moves.
export function PersistWarning() {
  const t = useTranslations("field.storage");
  const [persist, setPersist] = useState<PersistResult | null>(null);
  const [dismissed, setDismissed] = useState(false);

  useEffect(() => {
    let active = true;
    setDismissed(sessionStorage.getItem(DISMISSED) === "1");
    persistRequest ??= requestPersistentStorage();
    persistRequest.then(
      (result) => active && setPersist(result),
      (err: unknown) => console.error("Persistent storage request failed", err),
    );
    return () => {
      active = false;
    };
  }, []);

  if (persist !== "refused" || dismissed) return null;
  return (
    <div className="notice-caution mt-6 flex flex-wrap items-center gap-3">
      <p className="flex-1 basis-60">{t("persistRefused")}</p>
      <button
        type="button"
        className="btn-secondary"
        onClick={() => {
          sessionStorage.setItem(DISMISSED, "1");
          setDismissed(true);
        }}
      >
        {t("dismiss")}
      </button>
    </div>
  );
}
