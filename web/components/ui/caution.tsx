import { createContext, useContext, useId, useLayoutEffect, useState, type ReactNode } from 'react';

/**
 * The cautions of a page. Several panels on one page may each suggest a temperature or a time; the
 * safety caution is shown once, beside the newest of those results (the last to appear; among results
 * that appear together, the last in page order), and moves back to the previous one if that panel goes
 * away. Outside a scope (e.g. a panel tested on its own) every caution shows.
 */
interface CautionSlots {
  owners: string[];
  claim: (id: string) => () => void;
}

const CautionContext = createContext<CautionSlots | null>(null);

export function CautionScope({ children }: { children: ReactNode }) {
  const [owners, setOwners] = useState<string[]>([]);
  const [slots] = useState(() => ({
    claim: (id: string) => {
      setOwners((list) => (list.includes(id) ? list : [...list, id]));
      return () => setOwners((list) => list.filter((o) => o !== id));
    },
  }));
  return <CautionContext.Provider value={{ owners, claim: slots.claim }}>{children}</CautionContext.Provider>;
}

/** Whether this caution is the page's one (the newest claim in the scope), or there is no scope. */
function useShownOnce(): boolean {
  const scope = useContext(CautionContext);
  const id = useId();
  const claim = scope?.claim;
  useLayoutEffect(() => claim?.(id), [claim, id]);
  return scope === null || scope.owners[scope.owners.length - 1] === id;
}

/**
 * The safety caution shown wherever Eyrie suggests a temperature or a time.
 * Wording is ours; the content follows the product's safety brief.
 */
export function SafetyCaution({ compact = false }: { compact?: boolean }) {
  const shown = useShownOnce();
  if (!shown) return null;
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
          runaway). Get calorimetry and a process-safety review before changing temperature on scale; cryogenic work adds asphyxiation,
          embrittlement, freezing and mixing hazards. Follow local codes and licensed practice.
        </p>
      )}
    </aside>
  );
}
