import type { ReactNode } from 'react';

export function Page({ title, lead, actions, children }: { title: string; lead?: ReactNode; actions?: ReactNode; children: ReactNode }) {
  return (
    <div className="mx-auto max-w-7xl px-4 py-6 sm:px-6">
      <div className="mb-5 flex flex-wrap items-end justify-between gap-3">
        <div>
          <h1 className="text-2xl font-semibold tracking-tight text-ink-950">{title}</h1>
          {lead && <p className="mt-1 max-w-3xl text-sm text-ink-600">{lead}</p>}
        </div>
        {actions}
      </div>
      {children}
    </div>
  );
}

export function Panel({ title, children, className = '' }: { title?: ReactNode; children: ReactNode; className?: string }) {
  return (
    <section className={`rounded-lg border border-slate-200 bg-white p-4 shadow-sm ${className}`}>
      {title && <h2 className="mb-3 text-sm font-semibold uppercase tracking-wide text-ink-600">{title}</h2>}
      {children}
    </section>
  );
}
