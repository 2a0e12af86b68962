import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { getTranslations } from "next-intl/server";
import { listFertilizerPasses } from "@/db/queries/fertilizer-passes";
import { listPlantings } from "@/db/queries/plantings";
import { listProducts } from "@/db/queries/products";
import type { Planting } from "@/db/schema";
import { BoundarySection } from "./_components/boundary-section";
import { loadField } from "./_components/load-field";
import { NitrogenPanel } from "./_components/nitrogen-panel";
import { PassAuditView } from "./_components/pass-audit";
import { PassForm } from "./_components/pass-form";
import { PlantingForm } from "./_components/planting-form";
import { auditPass, budgetInputsFrom, fieldNitrogenBudget } from "./_components/records";
import { FieldAgronomyPanels } from "./_panels";

type Props = {
  params: Promise<{ fieldId: string }>;
  searchParams: Promise<Record<string, string | string[] | undefined>>;
};

export async function generateMetadata({ params }: Props): Promise<Metadata> {
  const { fieldId } = await params;
  const loaded = await loadField(fieldId);
  const t = await getTranslations("fieldPage");
  return { title: loaded ? t("metaTitle", { name: loaded.field.name }) : undefined };
}

const num = (x: number, digits = 2) => x.toLocaleString("en-US", { maximumFractionDigits: digits });
const HECTARES_PER_ACRE = 0.40468564224;

export default async function FieldPage({ params, searchParams }: Props) {
  const { fieldId } = await params;
  const loaded = await loadField(fieldId);
  if (!loaded) notFound();
  const { field, canEdit } = loaded;
  const t = await getTranslations("fieldPage");
  const [plantings, passes, products] = await Promise.all([
    listPlantings(field.id),
    listFertilizerPasses(field.id),
    listProducts(),
  ]);
  const productById = new Map(products.map((p) => [p.id, p]));
  const plantingById = new Map(plantings.map((p) => [p.id, p]));
  const plantingLabel = (p: Planting) => `${p.hybrid} (${p.plantedOn})`;
  const productName = (id: string) => productById.get(id)?.name ?? t("passes.unknownProduct");

  const budgetParams = budgetInputsFrom(await searchParams);
  const nitrogen = fieldNitrogenBudget(
    budgetParams.inputs,
    passes.map((pass) => ({
      label: `${productName(pass.productId)}, ${pass.appliedOn}`,
      pass,
      product: productById.get(pass.productId),
    })),
  );

  const productOptions = products.filter((p) => p.active).map((p) => ({ id: p.id, name: p.name }));
  const plantingOptions = plantings.map((p) => ({ id: p.id, label: plantingLabel(p) }));
  const sections = [
    ["plantings", t("plantings.heading")],
    ["fertilizer", t("passes.heading")],
    ["nitrogen", t("nitrogen.heading")],
    ["boundary", t("boundary.heading")],
  ] as const;

  return (
    <article aria-labelledby="field-heading" className="space-y-8">
      <header className="space-y-3">
        <h1 id="field-heading">{field.name}</h1>
        <dl className="grid gap-x-6 gap-y-2 sm:grid-cols-2 lg:grid-cols-3">
          {[
            [t("header.account"), field.accountName],
            [
              t("header.area"),
              field.areaAcres !== null
                ? t("header.areaValue", {
                    acres: num(field.areaAcres),
                    hectares: num(field.areaAcres * HECTARES_PER_ACRE),
                  })
                : t("header.areaUnknown"),
            ],
            [t("header.irrigation"), t(`irrigations.${field.irrigation}`)],
            [t("header.soil"), t(`soils.${field.soilTexture}`)],
            [t("header.station"), field.weatherStationName ?? t("header.noStation")],
            [t("header.firstIrrigation"), field.firstIrrigationOn ?? t("header.notYet")],
          ].map(([term, value]) => (
            <div key={term}>
              <dt className="text-sm font-semibold text-soil-700">{term}</dt>
              <dd>{value}</dd>
            </div>
          ))}
        </dl>
        <div className="flex flex-wrap gap-3">
          <Link className="btn-primary" href={`/fields/${field.id}/report`}>
            {t("header.report")}
          </Link>
          <a className="btn-secondary" href={`/api/exports/digs?fieldId=${field.id}`}>
            {t("header.exportDigs")}
          </a>
        </div>
        {canEdit ? null : <p className="notice-caution">{t("header.readOnly")}</p>}
        <nav aria-label={t("header.jump")}>
          <ul className="flex flex-wrap gap-x-4 gap-y-1">
            {sections.map(([id, label]) => (
              <li key={id}>
                <a className="font-semibold text-sprout-700 underline" href={`#${id}`}>
                  {label}
                </a>
              </li>
            ))}
          </ul>
        </nav>
      </header>

      <section id="plantings" aria-labelledby="plantings-heading" className="space-y-4">
        <h2 id="plantings-heading">{t("plantings.heading")}</h2>
        {plantings.length === 0 ? (
          <p className="notice-caution">{t("plantings.empty")}</p>
        ) : (
          <section
            className="overflow-x-auto rounded-card border border-soil-200 bg-white"
            aria-label={t("plantings.caption")}
            // biome-ignore lint/a11y/noNoninteractiveTabindex: a scrollable table must be reachable by keyboard
            tabIndex={0}
          >
            <table className="w-full text-left">
              <caption className="sr-only">{t("plantings.caption")}</caption>
              <thead className="bg-soil-100">
                <tr>
                  {(
                    [
                      ["hybrid", ""],
                      ["plantedOn", ""],
                      ["seedingRate", "text-right"],
                      ["seedingDepth", "text-right"],
                      ["rowSpacing", "text-right"],
                      ["soil", ""],
                      ["notes", ""],
                    ] as const
                  ).map(([key, align]) => (
                    <th key={key} scope="col" className={`p-3 ${align}`}>
                      {t(`plantings.${key}`)}
                    </th>
                  ))}
                </tr>
              </thead>
              <tbody>
                {plantings.map((p) => (
                  <tr key={p.id} className="border-t border-soil-200 align-top">
                    <th scope="row" className="p-3 font-semibold">
                      {p.hybrid}
                    </th>
                    <td className="p-3 whitespace-nowrap">{p.plantedOn}</td>
                    <td className="p-3 text-right">{num(p.seedingRate, 0)}</td>
                    <td className="p-3 text-right whitespace-nowrap">
                      {t("plantings.inches", { value: num(p.seedingDepthIn) })}
                    </td>
                    <td className="p-3 text-right whitespace-nowrap">
                      {t("plantings.inches", { value: num(p.rowSpacingIn) })}
                    </td>
                    <td className="p-3">{t(`soils.${p.soilTexture}`)}</td>
                    <td className="p-3">{p.notes}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </section>
        )}
        {canEdit ? (
          <div className="space-y-3">
            {plantings.map((p) => (
              <details key={p.id} className="card">
                <summary className="min-h-tap cursor-pointer py-2 font-semibold">
                  {t("plantings.editTitle", { hybrid: plantingLabel(p) })}
                </summary>
                <div className="mt-3">
                  <PlantingForm fieldId={field.id} planting={p} defaultSoil={field.soilTexture} />
                </div>
              </details>
            ))}
            <details className="card" open={plantings.length === 0}>
              <summary className="min-h-tap cursor-pointer py-2 font-semibold">{t("plantings.add")}</summary>
              <div className="mt-3">
                <PlantingForm fieldId={field.id} defaultSoil={field.soilTexture} />
              </div>
            </details>
          </div>
        ) : null}
      </section>

      <section id="fertilizer" aria-labelledby="fertilizer-heading" className="space-y-4">
        <h2 id="fertilizer-heading">{t("passes.heading")}</h2>
        <p>{t("passes.intro")}</p>
        <p className="notice-caution" role="note">
          {t("safety.caution")} {t("safety.guidance")}
        </p>
        {passes.length === 0 ? <p className="notice-caution">{t("passes.empty")}</p> : null}
        <ol className="space-y-4">
          {passes.map((pass, i) => {
            const product = productById.get(pass.productId);
            const audit = auditPass(pass, product, plantings);
            const auditPlanting = audit.plantingId ? plantingById.get(audit.plantingId) : undefined;
            const ownPlanting = pass.plantingId ? plantingById.get(pass.plantingId) : undefined;
            const headingId = `pass-${pass.id}`;
            return (
              <li key={pass.id} className="card">
                <h3 id={headingId} className="text-lg">
                  {t("passes.passTitle", { product: productName(pass.productId), date: pass.appliedOn })}
                </h3>
                <dl className="mt-2 grid gap-x-6 gap-y-1 sm:grid-cols-2 lg:grid-cols-3">
                  {[
                    [t("passes.chemistry"), product?.chemistry ?? "—"],
                    [
                      t("passes.grade"),
                      product
                        ? `${num(product.gradeN)}-${num(product.gradeP2o5)}-${num(product.gradeK2o)}-${num(product.gradeS)}`
                        : "—",
                    ],
                    [t("passes.rate"), `${num(pass.rate)} ${t(`passes.rateUnits.${pass.rateUnit}`)}`],
                    [t("passes.placement"), t(`placements.${pass.placement}`)],
                    [
                      t("passes.intended"),
                      pass.intendedBesideIn !== null && pass.intendedBelowIn !== null
                        ? t("passes.intendedValue", {
                            beside: num(pass.intendedBesideIn),
                            below: num(pass.intendedBelowIn),
                          })
                        : t("passes.intendedNone"),
                    ],
                    [t("passes.planting"), ownPlanting ? plantingLabel(ownPlanting) : t("passes.wholeField")],
                  ].map(([term, value]) => (
                    <div key={term}>
                      <dt className="text-sm font-semibold text-soil-700">{term}</dt>
                      <dd data-testid={term === t("passes.rate") ? "pass-rate" : undefined}>{value}</dd>
                    </div>
                  ))}
                </dl>
                {pass.notes ? <p className="mt-2 text-soil-700">{pass.notes}</p> : null}
                <PassAuditView
                  audit={audit}
                  plantingLabel={auditPlanting ? plantingLabel(auditPlanting) : null}
                  soilLabel={auditPlanting ? t(`soils.${auditPlanting.soilTexture}`) : null}
                  headingId={`${headingId}-audit-${i}`}
                />
                {canEdit ? (
                  <details className="mt-3">
                    <summary className="min-h-tap cursor-pointer py-2 font-semibold text-sprout-700">
                      {t("passes.edit")}
                    </summary>
                    <div className="mt-3">
                      <PassForm
                        fieldId={field.id}
                        pass={pass}
                        products={productOptions}
                        plantings={plantingOptions}
                      />
                    </div>
                  </details>
                ) : null}
              </li>
            );
          })}
        </ol>
        {canEdit ? (
          <details className="card">
            <summary className="min-h-tap cursor-pointer py-2 font-semibold">{t("passes.add")}</summary>
            <div className="mt-3">
              <PassForm fieldId={field.id} products={productOptions} plantings={plantingOptions} />
            </div>
          </details>
        ) : null}
      </section>

      <section id="nitrogen" aria-labelledby="nitrogen-heading" className="space-y-4">
        <h2 id="nitrogen-heading">{t("nitrogen.heading")}</h2>
        <NitrogenPanel fieldId={field.id} {...budgetParams} {...nitrogen} />
        <p className="text-sm">{t("safety.guidance")}</p>
      </section>

      <section id="boundary" aria-labelledby="boundary-heading" className="space-y-4">
        <h2 id="boundary-heading">{t("boundary.heading")}</h2>
        <BoundarySection
          field={{
            id: field.id,
            name: field.name,
            boundary: field.boundary,
            areaAcres: field.areaAcres,
            centroidLat: field.centroidLat,
            centroidLon: field.centroidLon,
          }}
          canEdit={canEdit}
        />
      </section>

      <FieldAgronomyPanels fieldId={field.id} canEdit={canEdit} />
    </article>
  );
}
