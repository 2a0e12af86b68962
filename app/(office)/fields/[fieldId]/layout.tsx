import { notFound } from "next/navigation";
import { loadField } from "./_components/load-field";

// The access check runs here, outside the segment's loading boundary, so a field the user may not
// read answers a real 404 before anything streams.
export default async function FieldLayout({
  children,
  params,
}: {
  children: React.ReactNode;
  params: Promise<{ fieldId: string }>;
}) {
  const { fieldId } = await params;
  if (!(await loadField(fieldId))) notFound();
  return children;
}
