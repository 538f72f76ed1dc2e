import { useEffect, useId, useRef, useState, type ReactNode, type RefObject } from 'react';
import { Link } from 'react-router-dom';
import type { UseQueryResult } from '@tanstack/react-query';

/** One step of a breadcrumb trail; the last one (the page itself) has no link. */
export interface Crumb {
  label: string;
  to?: string;
}

export function Page({
  title,
  lead,
  actions,
  crumbs,
  children,
}: {
  title: string;
  lead?: ReactNode;
  actions?: ReactNode;
  /** Where the page sits (e.g. Projects › Project › Campaign), shown above the title. */
  crumbs?: Crumb[];
  children: ReactNode;
}) {
  return (
    <div className="mx-auto max-w-7xl px-4 py-6 sm:px-6">
      {crumbs && crumbs.length > 0 && (
        <nav aria-label="Breadcrumb" className="mb-2 text-sm">
          <ol className="flex flex-wrap items-center gap-x-1.5 text-ink-600">
            {crumbs.map((c, i) => (
              <li key={`${i}-${c.label}`} className="flex min-w-0 items-center gap-x-1.5">
                {i > 0 && <span aria-hidden="true">›</span>}
                {c.to ? (
                  <Link className="truncate text-fjord-700 underline" to={c.to}>
                    {c.label}
                  </Link>
                ) : (
                  <span aria-current="page" className="truncate">
                    {c.label}
                  </span>
                )}
              </li>
            ))}
          </ol>
        </nav>
      )}
      <div className="mb-5 flex flex-wrap items-end justify-between gap-3">
        <div className="min-w-0">
          <h1 className="break-words text-2xl font-semibold tracking-tight text-ink-950">{title}</h1>
          {lead && <p className="mt-1 max-w-3xl text-sm text-ink-600">{lead}</p>}
        </div>
        {actions}
      </div>
      {children}
    </div>
  );
}

/**
 * The page shown while a page's record loads, or when it cannot be read: `title` while loading;
 * `missingTitle` with the server's reason (and `missing`, what that may mean) on failure.
 */
export function UnreadyPage({
  query,
  title,
  missingTitle,
  missing = null,
}: {
  query: Pick<UseQueryResult, 'isPending' | 'error'>;
  title: string;
  missingTitle: string;
  missing?: ReactNode;
}) {
  if (query.isPending || !query.error) {
    return (
      <Page title={title}>
        <p className="text-sm text-ink-500">Loading…</p>
      </Page>
    );
  }
  return (
    <Page title={missingTitle} lead={query.error.message}>
      {missing}
    </Page>
  );
}

/**
 * Whether the element's content is wider than its box (so it scrolls sideways); kept current as
 * either changes size. A box that scrolls takes the focus, so the keyboard can scroll it too.
 *
 * Read only in the observer's reports, which arrive after the browser's own layout (the first one
 * right after the box is first laid out): read as the element mounts, the sizes made the browser
 * lay out the whole page in the middle of React's commit.
 */
function useScrollsSideways<T extends HTMLElement>(): [RefObject<T | null>, boolean] {
  const ref = useRef<T>(null);
  const [scrolls, setScrolls] = useState(false);
  useEffect(() => {
    const el = ref.current;
    if (!el || typeof ResizeObserver === 'undefined') return;
    const check = () => setScrolls(el.scrollWidth > el.clientWidth + 1);
    const observer = new ResizeObserver(check);
    observer.observe(el);
    return () => observer.disconnect();
  }, []);
  return [ref, scrolls];
}

/** A wide table's own sideways-scrolling box (on a phone the page stays put); named while it scrolls. */
export function SidewaysScroll({ label, children }: { label: string; children: ReactNode }) {
  const [ref, scrolls] = useScrollsSideways<HTMLDivElement>();
  return (
    <div
      ref={ref}
      className="min-w-0 overflow-x-auto"
      tabIndex={scrolls ? 0 : undefined}
      role={scrolls ? 'region' : undefined}
      aria-label={scrolls ? label : undefined}
    >
      {children}
    </div>
  );
}

export function Panel({
  title,
  children,
  className = '',
  belowFirstScreen = false,
}: {
  title?: ReactNode;
  children: ReactNode;
  className?: string;
  /**
   * A panel a long page opens far below the first screen: laid out and painted only as it nears the
   * screen. Until then it keeps a reserved height its content may exceed, so it must not become a
   * vertical scroll box (it never scrolls that way once drawn): its vertical overflow is hidden.
   */
  belowFirstScreen?: boolean;
}) {
  const titleId = useId();
  // A panel whose content is wider than the screen scrolls sideways.
  const [ref, scrolls] = useScrollsSideways<HTMLElement>();
  return (
    // min-w-0 and overflow-x-auto: a wide table scrolls inside its panel instead of widening the page;
    // relative: visually hidden (absolutely placed) labels stay inside it too.
    <section
      ref={ref}
      tabIndex={scrolls ? 0 : undefined}
      aria-labelledby={title ? titleId : undefined}
      className={`relative min-w-0 overflow-x-auto rounded-lg border border-slate-200 bg-white p-4 shadow-sm ${belowFirstScreen ? 'laid-out-near-screen overflow-y-hidden' : ''} ${className}`}
    >
      {title && (
        <h2 id={titleId} className="mb-3 text-sm font-semibold uppercase tracking-wide text-ink-600">
          {title}
        </h2>
      )}
      {children}
    </section>
  );
}
