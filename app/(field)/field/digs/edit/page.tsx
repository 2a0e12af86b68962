import type { Metadata } from "next";
import { getTranslations } from "next-intl/server";
import { Suspense } from "react";
import { requirePageUser } from "@/lib/auth/session";
import { DigEditor } from "../_components/dig-editor";

export const metadata: Metadata = { title: "Edit dig" };

// /field/digs/edit?id=<dig id>: one stored page serves every dig offline (the service worker keeps
// field pages without their query string); the dig itself is read from this phone's database.
export default async function EditDigPage() {
  await requirePageUser(["rep", "supervisor", "admin"]);
  const t = await getTranslations("dig");
  return (
    <>
      <h1>{t("editTitle")}</h1>
      <Suspense fallback={<p role="status">{t("loading")}</p>}>
        <DigEditor mode="edit" />
      </Suspense>
    </>
  );
}
