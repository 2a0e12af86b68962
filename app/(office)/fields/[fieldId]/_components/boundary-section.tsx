import { getTranslations } from "next-intl/server";
import { BoundaryImportForm } from "./boundary-import";

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
      {canEdit ? (
        <div className="card space-y-3">
          <h3 className="text-lg">{t("importHeading")}</h3>
          <BoundaryImportForm fieldId={field.id} />
        </div>
      ) : null}
    </div>
  );
}
