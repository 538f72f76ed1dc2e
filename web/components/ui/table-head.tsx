import type { ReactNode } from 'react';

export interface Column {
  label: ReactNode;
  /** Unset: the table's own alignment (right in tables of numbers); text columns say 'left'. */
  align?: 'left' | 'right';
}

const ALIGN_CLASS = { left: 'text-left', right: 'text-right', inherit: null };

/** A table's column headers: one row of `th scope="col"`, each aligned as its column says. */
export function TableHead({ columns, className = 'bg-slate-50 text-xs text-ink-600' }: { columns: Column[]; className?: string }) {
  return (
    <thead className={className}>
      <tr className="border-b border-slate-200">
        {columns.map((c, i) => (
          <th key={i} scope="col" className={`px-2 py-1 font-medium ${ALIGN_CLASS[c.align ?? 'inherit'] ?? ''}`}>
            {c.label}
          </th>
        ))}
      </tr>
    </thead>
  );
}

export interface ListColumn {
  label: ReactNode;
  /** Unset: the table's own alignment. */
  align?: 'left' | 'right';
  /** Read by screen readers only (a column of links or buttons). */
  hidden?: boolean;
}

const LIST_HEAD = {
  roomy: { head: 'border-b border-slate-200 text-xs uppercase tracking-wide text-ink-500', pad: 'py-2', weight: 'font-semibold' },
  compact: { head: 'border-b border-slate-200 text-xs text-ink-600', pad: 'py-1.5', weight: 'font-medium' },
};

/** The column headers of a list of records (projects, members, tokens, files, campaigns): no cell padding on the last. */
export function ListHead({ columns, density = 'roomy' }: { columns: ListColumn[]; density?: keyof typeof LIST_HEAD }) {
  const style = LIST_HEAD[density];
  return (
    <thead className={style.head}>
      <tr>
        {columns.map((c, i) => (
          <th
            key={i}
            scope="col"
            className={[style.pad, i < columns.length - 1 ? 'pr-3' : null, ALIGN_CLASS[c.align ?? 'inherit'], style.weight]
              .filter(Boolean)
              .join(' ')}
          >
            {c.hidden ? <span className="sr-only">{c.label}</span> : c.label}
          </th>
        ))}
      </tr>
    </thead>
  );
}
