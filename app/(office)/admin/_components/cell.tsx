// A table cell that carries its column name on narrow screens, where the admin tables show as cards.
export function Cell({
  label,
  children,
  className = "",
}: {
  label: string;
  children: React.ReactNode;
  className?: string;
}) {
  return (
    <td className={`flex flex-wrap gap-x-2 py-0.5 align-top lg:table-cell lg:p-3 ${className}`}>
      <span aria-hidden="true" className="font-semibold text-soil-700 lg:hidden">
        {label}:
      </span>
      {children}
    </td>
  );
}
