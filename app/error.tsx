"use client";

import { useTranslations } from "next-intl";
import { useEffect } from "react";

export default function ErrorPage({
  error,
  reset,
}: {
  error: Error & { digest?: string };
  reset: () => void;
}) {
  const t = useTranslations("common.errors");
  useEffect(() => {
    console.error(error);
  }, [error]);
  return (
    <main id="main" className="mx-auto max-w-xl p-gutter">
      <div className="notice-error" role="alert">
        <h1>{t("title")}</h1>
        <p className="mt-2">{t("body")}</p>
        {error.digest ? <p className="mt-2 text-sm">Ref. {error.digest}</p> : null}
      </div>
      <button type="button" className="btn-primary mt-4" onClick={reset}>
        {t("retry")}
      </button>
    </main>
  );
}
