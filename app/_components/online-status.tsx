"use client";

import { useTranslations } from "next-intl";
import { useSyncExternalStore } from "react";

function subscribe(onChange: () => void) {
  window.addEventListener("online", onChange);
  window.addEventListener("offline", onChange);
  return () => {
    window.removeEventListener("online", onChange);
    window.removeEventListener("offline", onChange);
  };
}

// A plain "Offline" badge so the rep knows the page is working from what the phone holds.
export function OnlineStatus() {
  const t = useTranslations("field");
  const online = useSyncExternalStore(
    subscribe,
    () => navigator.onLine,
    () => true,
  );
  return online ? null : (
    <span role="status" className="rounded-full bg-caution-500 px-3 py-1 text-sm font-bold text-soil-900">
      {t("offline")}
    </span>
  );
}
