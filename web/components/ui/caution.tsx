/**
 * The safety caution shown wherever Eyrie suggests a temperature or a time.
 * Wording is ours; the content follows the product's safety brief.
 */
export function SafetyCaution({ compact = false }: { compact?: boolean }) {
  return (
    <aside
      role="note"
      aria-label="Safety caution"
      className="rounded-md border border-amber-300 bg-caution-50 px-3 py-2 text-sm text-caution-700"
    >
      <p className="font-medium">
        <span aria-hidden="true">⚠ </span>Model estimate — confirm at the chosen temperature before relying on it.
      </p>
      {!compact && (
        <p className="mt-1">
          A colder, slower reaction can build up unreacted dosed reagent that a cooling failure or warm-up releases at once (thermal
          runaway). Get calorimetry and a process-safety review before changing temperature on scale; cryogenic work adds
          asphyxiation, embrittlement, freezing and mixing hazards. Follow local codes and licensed practice.
        </p>
      )}
    </aside>
  );
}
