// The field page's agronomy panels (weather import, GDD curve and dig window, digs over time by
// hybrid, hybrid comparison). Placeholder until those panels land.
export async function FieldAgronomyPanels(_props: { fieldId: string; canEdit: boolean }) {
  return null;
}
