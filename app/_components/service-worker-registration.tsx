"use client";

import { useTranslations } from "next-intl";
import { useEffect, useRef, useState } from "react";
import type { Workbox } from "workbox-window";

// The field app's pages stored for offline use after the first online visit; /field/offline is the
// page shown for one never stored.
const FIELD_PAGES = [
  "/field",
  "/field/digs",
  "/field/digs/new",
  "/field/digs/edit",
  "/field/calculator",
  "/field/offline",
];

// Registers public/sw.js and offers a reload when a new version is waiting. It never reloads on its
// own: a rep may be halfway through a form.
export function ServiceWorkerRegistration() {
  const t = useTranslations("field.update");
  const [waiting, setWaiting] = useState(false);
  const wbRef = useRef<Workbox | null>(null);

  useEffect(() => {
    if (!("serviceWorker" in navigator)) return;
    let cancelled = false;
    void import("workbox-window").then(({ Workbox }) => {
      if (cancelled) return;
      const wb = new Workbox("/sw.js", { scope: "/" });
      wbRef.current = wb;
      wb.addEventListener("waiting", () => setWaiting(true));
      wb.addEventListener("controlling", (event) => {
        if (event.isUpdate) window.location.reload();
      });
      wb.register()
        .then(() => navigator.serviceWorker.ready)
        .then((reg) =>
          reg.active?.postMessage({
            type: "CACHE_FIELD_PAGES",
            urls: [...new Set([window.location.pathname, ...FIELD_PAGES])],
          }),
        )
        .catch((err: unknown) => console.error("Service worker registration failed", err));
    });
    return () => {
      cancelled = true;
    };
  }, []);

  if (!waiting) return null;
  return (
    <div role="status" className="fixed inset-x-0 bottom-20 z-40 mx-auto max-w-md px-gutter">
      <div className="card flex items-center gap-3 border-2 border-water-500">
        <p className="flex-1 font-semibold">{t("ready")}</p>
        <button type="button" className="btn-primary" onClick={() => wbRef.current?.messageSkipWaiting()}>
          {t("reload")}
        </button>
      </div>
    </div>
  );
}
