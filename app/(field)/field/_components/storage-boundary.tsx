"use client";

import { useTranslations } from "next-intl";
import { Component, type ErrorInfo, type ReactNode } from "react";
import { classifyStorageError } from "@/sync/client/storage";

function StorageProblem({ error, onRetry }: { error: unknown; onRetry: () => void }) {
  const t = useTranslations("field.storage");
  const kind = classifyStorageError(error);
  const message = error instanceof Error ? error.message : String(error);
  return (
    <div className="notice-error">
      <p className="font-bold">
        {kind === "unavailable"
          ? t("unavailableTitle")
          : kind === "quota"
            ? t("quotaTitle")
            : t("otherTitle")}
      </p>
      <p className="mt-1">
        {kind === "unavailable"
          ? t("unavailableBody")
          : kind === "quota"
            ? t("quotaBody")
            : t("otherBody", { message })}
      </p>
      <button type="button" className="btn-secondary mt-3" onClick={onRetry}>
        {t("retry")}
      </button>
    </div>
  );
}

// Views that read this phone's database (useLiveQuery throws what IndexedDB throws) show the failure
// in place of their content instead of a blank screen; the error is logged, never swallowed.
export class StorageBoundary extends Component<{ children: ReactNode }, { error: unknown }> {
  state: { error: unknown } = { error: null };

  static getDerivedStateFromError(error: unknown) {
    return { error };
  }

  componentDidCatch(error: unknown, info: ErrorInfo) {
    console.error("Reading this phone's records failed", error, info.componentStack);
  }

  render() {
    if (this.state.error) {
      return <StorageProblem error={this.state.error} onRetry={() => this.setState({ error: null })} />;
    }
    return this.props.children;
  }
}
