import { useEffect, useId, useRef, useState } from 'react';

/**
 * The sign convention, stated once per page: a one-line summary and a "?" button that opens a short
 * explanation. The button reports its state with aria-expanded; Escape or a second press closes it and
 * focus stays on the button.
 */
export function SignConvention({ className = '' }: { className?: string }) {
  const [open, setOpen] = useState(false);
  const panelId = useId();
  const buttonRef = useRef<HTMLButtonElement>(null);
  const boxRef = useRef<HTMLDivElement>(null);

  useEffect(() => {
    if (!open) return;
    const onPointer = (event: PointerEvent) => {
      if (boxRef.current && !boxRef.current.contains(event.target as Node)) setOpen(false);
    };
    document.addEventListener('pointerdown', onPointer);
    return () => document.removeEventListener('pointerdown', onPointer);
  }, [open]);

  return (
    <div
      ref={boxRef}
      className={`relative text-xs text-ink-600 ${className}`}
      onKeyDown={(event) => {
        if (event.key === 'Escape' && open) {
          event.stopPropagation();
          setOpen(false);
          buttonRef.current?.focus();
        }
      }}
    >
      <p className="flex flex-wrap items-center gap-x-1.5">
        <span className="font-medium text-ink-800">Sign convention:</span>
        <span>ΔΔX‡ = X‡(TS→B) − X‡(TS→A); positive favours A, r = [A]/[B].</span>
        <button
          ref={buttonRef}
          type="button"
          aria-expanded={open}
          aria-controls={panelId}
          aria-label="About the sign convention"
          onClick={() => setOpen((o) => !o)}
          className="inline-flex h-5 w-5 items-center justify-center rounded-full border border-slate-400 bg-white text-[11px] font-semibold text-ink-700 hover:bg-slate-50 focus:outline-none focus-visible:ring-2 focus-visible:ring-fjord-600"
        >
          ?
        </button>
      </p>
      <div
        id={panelId}
        role="note"
        aria-label="Sign convention explained"
        hidden={!open}
        className="absolute left-0 top-full z-20 mt-1 w-[min(26rem,calc(100vw-2rem))] rounded-md border border-slate-300 bg-white p-3 text-xs text-ink-700 shadow-lg"
      >
        <p>
          Eyrie takes every difference as B minus A: ΔΔX‡ = X‡(TS→B) − X‡(TS→A) for G, H and S. A positive ΔΔG‡ or ΔΔH‡ means the path to A
          has the lower barrier, so A is favoured, and the ratio is r = [A]/[B] (ln r = ΔΔG‡/RT).
        </p>
        <p className="mt-1.5">Much of the literature uses the opposite sign (A minus B); flip the sign before comparing with a paper.</p>
      </div>
    </div>
  );
}
