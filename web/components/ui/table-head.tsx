import type { ReactNode } from 'react';

export interface Column {
  label: ReactNode;
  /** Numbers are right-aligned (the default); text columns say 'left'. */
  align?: 'left' | 'right';
}

/** A table's column headers: one row of `th scope="col"`, numbers right-aligned. */
export function TableHead({ columns, className = 'bg-slate-50 text-xs text-ink-600' }: { columns: Column[]; className?: string }) {
  return (
    <thead className={className}>
      <tr className="border-b border-slate-200">
        {columns.map((c, i) => (
          <th key={i} scope="col" className={`px-2 py-1 font-medium ${c.align === 'left' ? 'text-left' : ''}`}>
            {c.label}
          </th>
        ))}
      </tr>
    </thead>
  );
}
