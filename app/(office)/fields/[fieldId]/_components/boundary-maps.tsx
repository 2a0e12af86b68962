"use client";

import { useTranslations } from "next-intl";
import { useState, useTransition } from "react";
import { BoundaryDrawMap, PointMap, type PolygonGeometry } from "@/app/(office)/_components/map";
import { type BoundaryResult, saveDrawnBoundaryAction } from "../actions";
import { BoundaryOutcome } from "./boundary-import";

interface Tiles {
  tileUrl?: string;
  tileAttribution?: string;
}

/** The field's boundary around its centre, on the plain map (or tiles when configured). */
export function BoundaryView({
  boundary,
  latitude,
  longitude,
  ...tiles
}: Tiles & { boundary: PolygonGeometry; latitude: number; longitude: number }) {
  return <PointMap latitude={latitude} longitude={longitude} boundary={boundary} height="18rem" {...tiles} />;
}

/**
 * Draw the boundary on the map and save it through the same validation and versioned update as an
 * imported file. The map loads only when the section is opened.
 */
export function BoundaryDraw({
  fieldId,
  initial,
  center,
  ...tiles
}: Tiles & { fieldId: string; initial: PolygonGeometry | null; center?: [number, number] }) {
  const t = useTranslations("fieldPage.boundary");
  const [open, setOpen] = useState(false);
  const [drawn, setDrawn] = useState<PolygonGeometry | null>(null);
  const [state, setState] = useState<BoundaryResult | null>(null);
  const [pending, startTransition] = useTransition();
  return (
    <details className="card" onToggle={(e) => setOpen(e.currentTarget.open)}>
      <summary className="min-h-tap cursor-pointer py-2 text-lg font-semibold">{t("drawHeading")}</summary>
      {open ? (
        <div className="mt-3 space-y-3">
          <p className="text-sm text-soil-700">{t("drawHint")}</p>
          <BoundaryDrawMap initial={initial} onChange={setDrawn} center={center} {...tiles} />
          <BoundaryOutcome state={state} />
          <button
            type="button"
            className="btn-primary"
            disabled={pending}
            aria-disabled={pending}
            onClick={() => {
              if (!drawn) {
                setState({ error: t("drawNothing") });
                return;
              }
              startTransition(async () => {
                try {
                  setState(await saveDrawnBoundaryAction(fieldId, drawn));
                } catch {
                  setState({ error: t("drawUnreachable") });
                }
              });
            }}
          >
            {pending ? t("drawSaving") : t("drawSave")}
          </button>
        </div>
      ) : null}
    </details>
  );
}
