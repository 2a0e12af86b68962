import type { MetadataRoute } from "next";
import { getTranslations } from "next-intl/server";
import tailwind from "@/tailwind.config";

type Palette = Record<string, Record<string, string>>;

// Colours come from the design tokens so the splash screen and status bar match the field app.
function token(name: string, step: number): string {
  const value = (tailwind.theme?.extend?.colors as Palette | undefined)?.[name]?.[step];
  if (!value) throw new Error(`tailwind.config.ts has no colour ${name}-${step}`);
  return value;
}

// The installable field app: it opens on Today, full screen like an app.
export default async function manifest(): Promise<MetadataRoute.Manifest> {
  const t = await getTranslations({ locale: "en", namespace: "common" });
  return {
    id: "/field",
    name: t("appName"),
    short_name: t("appName"),
    description: t("tagline"),
    start_url: "/field",
    scope: "/",
    display: "standalone",
    orientation: "portrait",
    theme_color: token("sprout", 900),
    background_color: token("soil", 50),
    categories: ["productivity", "utilities"],
    icons: [
      { src: "/icons/icon-192.png", sizes: "192x192", type: "image/png", purpose: "any" },
      { src: "/icons/icon-512.png", sizes: "512x512", type: "image/png", purpose: "any" },
      { src: "/icons/icon-maskable-512.png", sizes: "512x512", type: "image/png", purpose: "maskable" },
      { src: "/icons/icon.svg", sizes: "any", type: "image/svg+xml", purpose: "any" },
    ],
  };
}
