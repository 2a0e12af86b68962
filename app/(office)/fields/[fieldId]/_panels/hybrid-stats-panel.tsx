import { getFormatter, getTranslations } from "next-intl/server";
import { ALPHA, type HybridComparison, MIN_REPLICATES, SMALL_N } from "./hybrid-stats";

export async function HybridStatsPanel({ comparison }: { comparison: HybridComparison }) {
  const t = await getTranslations("fieldPage.panels.stats");
  const format = await getFormatter();
  const one = (v: number) => format.number(v, { minimumFractionDigits: 1, maximumFractionDigits: 1 });
  const pValue = (p: number) => (p < 0.001 ? "< 0.001" : format.number(p, { maximumFractionDigits: 3 }));

  if (comparison.kind === "needMore") {
    return (
      <p className="mt-2">{t("needMore", { min: MIN_REPLICATES, have: comparison.hybridsWithReplicates })}</p>
    );
  }
  return (
    <>
      <p className="mt-2">{t("intro", { alpha: ALPHA * 100 })}</p>
      <div className="mt-3 overflow-x-auto">
        <table className="min-w-full text-sm">
          <caption className="text-left font-semibold">{t("summaryCaption")}</caption>
          <thead>
            <tr>
              <th scope="col" className="px-2 py-1 text-left">
                {t("hybrid")}
              </th>
              <th scope="col" className="px-2 py-1 text-right">
                {t("n")}
              </th>
              <th scope="col" className="px-2 py-1 text-right">
                {t("mean")}
              </th>
              <th scope="col" className="px-2 py-1 text-right">
                {t("sd")}
              </th>
            </tr>
          </thead>
          <tbody>
            {comparison.summaries.map((s) => (
              <tr key={s.hybrid} className="border-t border-soil-100">
                <th scope="row" className="px-2 py-1 text-left font-normal">
                  {s.hybrid}
                </th>
                <td className="px-2 py-1 text-right tabular-nums">{s.n}</td>
                <td className="px-2 py-1 text-right tabular-nums">{one(s.mean)}</td>
                <td className="px-2 py-1 text-right tabular-nums">{one(s.sd)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      <h3 className="mt-4 font-semibold">{t("pairsHeading")}</h3>
      <ul className="mt-2 space-y-2">
        {comparison.pairs.map((pair) => {
          const higher = pair.difference >= 0 ? pair.a : pair.b;
          const lower = pair.difference >= 0 ? pair.b : pair.a;
          return (
            <li key={`${pair.a}|${pair.b}`} className="card">
              <p className="font-semibold">{t("pairTitle", { a: pair.a, b: pair.b })}</p>
              {pair.welch === null ? (
                <p>{t("noSpread")}</p>
              ) : (
                <>
                  <p>
                    {pair.clear
                      ? t("clear", {
                          higher,
                          lower,
                          diff: one(Math.abs(pair.difference)),
                          alpha: ALPHA * 100,
                        })
                      : t("notClear", {
                          higher,
                          lower,
                          diff: one(Math.abs(pair.difference)),
                          alpha: ALPHA * 100,
                        })}
                  </p>
                  <p className="text-sm text-soil-700">
                    {t("numbers", {
                      t: format.number(pair.welch.t, { maximumFractionDigits: 2 }),
                      df: one(pair.welch.df),
                      p: pValue(pair.welch.p),
                    })}
                  </p>
                </>
              )}
            </li>
          );
        })}
      </ul>
      <p className={comparison.smallN ? "notice-caution mt-3 text-sm" : "mt-3 text-sm text-soil-700"}>
        {comparison.smallN ? t("smallN", { small: SMALL_N }) : t("caveat")}
      </p>
    </>
  );
}
