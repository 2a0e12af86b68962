import { getRequestConfig } from "next-intl/server";
import { loadMessages } from "./messages";

// English only for now; the catalogs are split by area (lib/i18n/messages/<locale>/<area>.json).
export default getRequestConfig(async () => {
  const locale = "en";
  return { locale, messages: await loadMessages(locale), timeZone: "UTC" };
});
