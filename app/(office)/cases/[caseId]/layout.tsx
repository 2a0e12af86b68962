import { notFound } from "next/navigation";
import { caseReadableBy } from "@/db/queries/case-view";
import { requirePageUser } from "@/lib/auth/session";

// The access check runs here, outside the segment's loading boundary, so a case the user may not
// read answers a real 404 before anything streams.
export default async function CaseLayout({
  children,
  params,
}: {
  children: React.ReactNode;
  params: Promise<{ caseId: string }>;
}) {
  const user = await requirePageUser();
  const { caseId } = await params;
  if (!(await caseReadableBy(user, caseId))) notFound();
  return children;
}
