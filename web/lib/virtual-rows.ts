import { elementScroll, type Virtualizer } from '@tanstack/react-virtual';

/*
 * Options for a virtualizer that never force a layout. The library's own helpers read the scroll
 * box's size as it is attached and each new row's offsetHeight as React attaches it: every such read
 * makes the browser lay out the whole page then and there, in the middle of React's commit, and on
 * a page of a thousand runs those layouts were much of the first second. Here the sizes come from
 * ResizeObserver reports, which the browser delivers after its own layout; until then the
 * virtualizer uses its initial rect and the rows' estimated (or already known) sizes.
 */

/** A row's size: its known (or estimated) size until the virtualizer's ResizeObserver reports its border box. */
export function measureRowAfterLayout<E extends Element>(
  element: E,
  entry: ResizeObserverEntry | undefined,
  instance: Virtualizer<HTMLDivElement, E>,
): number {
  const box = entry?.borderBoxSize?.[0];
  if (box) return Math.round(box.blockSize);
  const index = instance.indexFromElement(element);
  return instance.itemSizeCache.get(instance.options.getItemKey(index)) ?? instance.options.estimateSize(index);
}

/** The scroll box's size from a ResizeObserver only (read at once where there is none, as in some test environments). */
export function observeBoxAfterLayout<E extends Element>(
  instance: Virtualizer<HTMLDivElement, E>,
  report: (rect: { width: number; height: number }) => void,
): (() => void) | undefined {
  const box = instance.scrollElement;
  if (!box) return undefined;
  const read = () => report({ width: box.clientWidth, height: box.clientHeight });
  if (typeof ResizeObserver === 'undefined') {
    read();
    return undefined;
  }
  // Inside the callback the layout is fresh, so reading the client size costs nothing.
  const observer = new ResizeObserver(read);
  observer.observe(box);
  return () => observer.disconnect();
}

const attached = new WeakSet<Element>();

/**
 * Scrolls the box as the library does, except the write it makes as it attaches a new box: that
 * write puts the box where a new box already is (the top), yet scrollTo would lay out the page first.
 */
export function scrollBoxTo<E extends Element>(
  offset: number,
  options: { adjustments?: number; behavior?: ScrollBehavior },
  instance: Virtualizer<HTMLDivElement, E>,
): void {
  const box = instance.scrollElement;
  if (box && !attached.has(box)) {
    attached.add(box);
    if (offset + (options.adjustments ?? 0) === 0) return;
  }
  elementScroll(offset, options, instance);
}
