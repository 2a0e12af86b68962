import { getTranslations } from "next-intl/server";
import type { PolygonGeometry } from "@/app/(office)/_components/map";
import { env } from "@/lib/env";
import { BoundaryImportForm } from "./boundary-import";
import { BoundaryDraw, BoundaryView } from "./boundary-maps";

const HECTARES_PER_ACRE = 0.40468564224;
const num = (x: number, digits: number) => x.toLocaleString("en-US", { maximumFractionDigits: digits });

export interface BoundaryField {
  id: string;
  name: string;
  boundary: unknown;
  areaAcres: number | null;
  centroidLat: number | null;
  centroidLon: number | null;
}

/** The field's current boundary and, for its editors, the file import and the drawing map. */
export async function BoundarySection({ field, canEdit }: { field: BoundaryField; canEdit: boolean }) {
  const t = await getTranslations("fieldPage.boundary");
  const hasBoundary = field.boundary !== null && field.areaAcres !== null;
  const polygon = asPolygon(field.boundary);
  const tiles = { tileUrl: env.MAP_TILE_URL, tileAttribution: env.MAP_TILE_ATTRIBUTION };
  const center: [number, number] | undefined =
    field.centroidLat !== null && field.centroidLon !== null
      ? [field.centroidLat, field.centroidLon]
      : undefined;
  return (
    <div className="space-y-4">
      {hasBoundary && field.centroidLat !== null && field.centroidLon !== null ? (
        <p data-testid="boundary-summary">
          {t("summary", {
            acres: num(field.areaAcres!, 2),
            hectares: num(field.areaAcres! * HECTARES_PER_ACRE, 2),
            lat: num(field.centroidLat, 5),
            lon: num(field.centroidLon, 5),
          })}
        </p>
      ) : (
        <p className="notice-caution">{t("none")}</p>
      )}
      {polygon && center ? (
        <BoundaryView boundary={polygon} latitude={center[0]} longitude={center[1]} {...tiles} />
      ) : null}
      {canEdit ? (
        <div className="card space-y-3">
          <h3 className="text-lg">{t("importHeading")}</h3>
          <BoundaryImportForm fieldId={field.id} />
        </div>
      ) : null}
      {canEdit ? <BoundaryDraw fieldId={field.id} initial={polygon} center={center} {...tiles} /> : null}
    </div>
  );
}

// The stored boundary as the maps draw it: a Polygon as stored, or null for anything else.
function asPolygon(boundary: unknown): PolygonGeometry | null {
  const b = boundary as { type?: unknown; coordinates?: unknown } | null;
  return b && b.type === "Polygon" && Array.isArray(b.coordinates) ? (b as PolygonGeometry) : null;
}
