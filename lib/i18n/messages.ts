import admin from "./messages/en/admin.json";
import auth from "./messages/en/auth.json";
import common from "./messages/en/common.json";
import dig from "./messages/en/dig.json";
import field from "./messages/en/field.json";
import home from "./messages/en/home.json";
import products from "./messages/en/products.json";
import sync from "./messages/en/sync.json";
import office from "./messages/en/office.json";
import map from "./messages/en/map.json";
import fieldPage from "./messages/en/fieldPage.json";
import reports from "./messages/en/reports.json";
import cases from "./messages/en/cases.json";
import caseMail from "./messages/en/caseMail.json";
import grower from "./messages/en/grower.json";

// One catalog per area, merged into namespaces; add a new area's file here.
const catalogs = {
  en: {
    common,
    auth,
    admin,
    home,
    field,
    products,
    dig,
    sync,
    office,
    map,
    fieldPage,
    reports,
    cases,
    caseMail,
    grower,
  },
} as const;

export type Locale = keyof typeof catalogs;
export type Messages = (typeof catalogs)["en"];

export async function loadMessages(locale: string): Promise<Messages> {
  return catalogs[(locale in catalogs ? locale : "en") as Locale];
}

export type Namespace = keyof Messages;

// Client components get only the catalogs of their part of the app, not every catalog on every page.
export function pickMessages(messages: Record<string, unknown>, namespaces: readonly Namespace[]) {
  return Object.fromEntries(namespaces.map((n) => [n, messages[n]]));
}
