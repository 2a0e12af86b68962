import { getTranslations } from "next-intl/server";
import { requirePageUser } from "@/lib/auth/session";
import { AdminNav } from "./_components/admin-nav";

// Admins only: anyone else gets the not-found page, so the screens' existence reveals nothing.
export default async function AdminLayout({ children }: { children: React.ReactNode }) {
  await requirePageUser(["admin"]);
  const t = await getTranslations("common.nav");
  const ta = await getTranslations("admin");
  return (
    <div className="space-y-6">
      <AdminNav
        label={ta("nav.label")}
        links={[
          { href: "/admin/users", label: t("users") },
          { href: "/admin/regions", label: t("regions") },
          { href: "/admin/accounts", label: t("accounts") },
          { href: "/admin/products", label: t("products") },
        ]}
      />
      {children}
    </div>
  );
}
