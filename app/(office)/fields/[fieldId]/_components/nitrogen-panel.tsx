import { getTranslations } from "next-intl/server";
import type { NitrogenBudget } from "@/lib/agronomy";
import { BUDGET_LIMITS, type BudgetField, type BudgetInputs, DEFAULT_GOALS } from "./records";

const fmt = (x: number, digits = 0) => x.toLocaleString("en-US", { maximumFractionDigits: digits });

/**
 * The nitrogen budget with its lines, formula and sources, and a small GET form whose inputs live in
 * the page's address (nothing is stored).
 */
export async function NitrogenPanel({
  fieldId,
  inputs,
  raw,
  invalid,
  budget,
  skipped,
  error,
}: {
  fieldId: string;
  inputs: BudgetInputs;
  raw: Record<BudgetField | "crop", string>;
  invalid: BudgetField[];
  budget: NitrogenBudget | null;
  skipped: string[];
  error: string | null;
}) {
  const t = await getTranslations("fieldPage.nitrogen");
  const unit = t(`goalUnit.${inputs.crop}`);
  const field = (name: BudgetField, label: string, limits: { min: number; max: number }, hint?: string) => {
    const bad = invalid.includes(name);
    const id = `n-${name}`;
    const describedBy = [hint ? `${id}-hint` : null, bad ? `${id}-error` : null].filter(Boolean).join(" ");
    return (
      <div>
        <label htmlFor={id} className="field-label">
          {label}
          {name === "goal" ? (
            ` (${unit})`
          ) : (
            <span className="font-normal text-soil-700"> ({t("optional")})</span>
          )}
        </label>
        <input
          id={id}
          name={name}
          inputMode="decimal"
          className="field-input"
          defaultValue={name === "goal" ? raw.goal || String(inputs.goal) : raw[name]}
          aria-invalid={bad ? true : undefined}
          aria-describedby={describedBy || undefined}
        />
        {hint ? (
          <p id={`${id}-hint`} className="mt-1 text-sm text-soil-700">
            {hint}
          </p>
        ) : null}
        {bad ? (
          <p id={`${id}-error`} className="field-error">
            {t("rangeError", { min: limits.min, max: limits.max })}
          </p>
        ) : null}
      </div>
    );
  };
  return (
    <div className="space-y-4">
      <p>{t("intro")}</p>
      <form method="get" action={`/fields/${fieldId}#nitrogen`} className="space-y-4">
        <div className="grid gap-4 sm:grid-cols-2 lg:grid-cols-3">
          <div>
            <label htmlFor="n-crop" className="field-label">
              {t("crop")}
            </label>
            <select id="n-crop" name="crop" className="field-input" defaultValue={inputs.crop}>
              <option value="grain">{t("grain")}</option>
              <option value="silage">{t("silage")}</option>
            </select>
          </div>
          {field(
            "goal",
            t("goal"),
            BUDGET_LIMITS[inputs.crop],
            raw.goal ? undefined : t("goalDefault", { value: DEFAULT_GOALS[inputs.crop], unit }),
          )}
          {field("soilPpm", t("soilPpm"), BUDGET_LIMITS.soilPpm)}
          {field("soilDepthFt", t("soilDepth"), BUDGET_LIMITS.soilDepthFt)}
          {field("waterPpm", t("waterPpm"), BUDGET_LIMITS.waterPpm)}
          {field("waterAcreIn", t("waterIn"), BUDGET_LIMITS.waterAcreIn)}
          {field("previousLbN", t("previous"), BUDGET_LIMITS.previousLbN)}
        </div>
        {invalid.length > 0 ? (
          <p role="alert" className="notice-error">
            {t("invalid")}
          </p>
        ) : null}
        <button type="submit" className="btn-secondary">
          {t("update")}
        </button>
      </form>
      {error ? <p className="notice-error">{t("error", { message: error })}</p> : null}
      {budget ? (
        <div className="card space-y-3">
          <p>
            <span className="block text-sm font-semibold text-soil-700">{t("sideDress")}</span>
            <span className="text-3xl font-bold" data-testid="side-dress-n">
              {fmt(budget.sideDressNeededLbNPerAcre)}
            </span>{" "}
            lb N/acre
          </p>
          {budget.surplusLbNPerAcre > 0 ? (
            <p className="font-semibold">{t("surplus", { value: fmt(budget.surplusLbNPerAcre) })}</p>
          ) : null}
          <div className="overflow-x-auto">
            <table className="w-full text-left text-sm">
              <caption className="sr-only">{t("caption")}</caption>
              <thead>
                <tr className="border-b border-soil-300">
                  <th scope="col" className="py-1 pr-3">
                    {t("line")}
                  </th>
                  <th scope="col" className="py-1 pr-3 text-right">
                    {t("amount")}
                  </th>
                  <th scope="col" className="py-1">
                    {t("lineSource")}
                  </th>
                </tr>
              </thead>
              <tbody>
                {budget.lines.map((line) => (
                  <tr key={line.key} className="border-t border-soil-200">
                    <th scope="row" className="py-1 pr-3 font-normal">
                      {line.label}
                    </th>
                    <td className="py-1 pr-3 text-right font-bold">
                      {line.kind === "need" ? "" : "−"}
                      {fmt(line.lbNPerAcre)}
                    </td>
                    <td className="py-1 text-soil-700">{line.source}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
          {skipped.length > 0 ? (
            <p className="notice-caution">{t("skipped", { passes: skipped.join("; ") })}</p>
          ) : null}
          <p className="text-sm text-soil-700">{t("formula")}</p>
          <p className="text-sm text-soil-700">{t("source")}</p>
        </div>
      ) : null}
    </div>
  );
}
