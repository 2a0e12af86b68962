"use client";

import { useTranslations } from "next-intl";
import { useEffect, useRef, useState } from "react";
import { fieldDb } from "@/sync/client/db";

export const SAFETY_KEY = "safetyAcknowledgedOn";

/** Today's date on the phone's clock, YYYY-MM-DD. */
export function localDay(now = new Date()): string {
  const pad = (n: number) => String(n).padStart(2, "0");
  return `${now.getFullYear()}-${pad(now.getMonth() + 1)}-${pad(now.getDate())}`;
}

// The usual cautions before the first dig of the day, in a modal dialog; acknowledging them keeps
// the dialog away until tomorrow (stored on this phone). Closing it with Escape asks again next time.
export function SafetyDialog() {
  const t = useTranslations("dig.safety");
  const ref = useRef<HTMLDialogElement>(null);
  const [open, setOpen] = useState(false);
  const [error, setError] = useState<string | null>(null);

  useEffect(() => {
    let cancelled = false;
    fieldDb()
      .meta.get(SAFETY_KEY)
      .then((row) => {
        if (!cancelled && row?.value !== localDay()) setOpen(true);
      })
      .catch((err: unknown) => {
        // Without the database the cautions are shown anyway: better twice than never.
        console.error("Could not read the safety acknowledgement", err);
        if (!cancelled) setOpen(true);
      });
    return () => {
      cancelled = true;
    };
  }, []);

  useEffect(() => {
    const dialog = ref.current;
    if (open && dialog && !dialog.open) dialog.showModal();
  }, [open]);

  async function acknowledge() {
    try {
      await fieldDb().meta.put({ key: SAFETY_KEY, value: localDay() });
    } catch (err) {
      console.error("Could not store the safety acknowledgement", err);
      setError(t("notStored"));
    }
    ref.current?.close();
  }

  if (!open) return null;
  return (
    <dialog
      ref={ref}
      aria-labelledby="safety-title"
      aria-describedby="safety-intro"
      onClose={() => setOpen(false)}
      className="m-auto w-[min(36rem,calc(100vw-2rem))] rounded-card border-4 border-caution-500 bg-white p-0 text-soil-900 backdrop:bg-soil-900/70"
    >
      <div className="p-gutter">
        <h2 id="safety-title">{t("title")}</h2>
        <p id="safety-intro" className="mt-2">
          {t("intro")}
        </p>
        <ul className="mt-3 list-disc space-y-2 pl-6">
          <li>{t("utilities")}</li>
          <li>{t("irrigation")}</li>
          <li>{t("seed")}</li>
          <li>{t("heat")}</li>
        </ul>
        {error ? (
          <p role="alert" className="field-error">
            {error}
          </p>
        ) : null}
        <button type="button" className="btn-primary mt-4 w-full" onClick={() => void acknowledge()}>
          {t("acknowledge")}
        </button>
      </div>
    </dialog>
  );
}
