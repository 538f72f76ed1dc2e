import { useCallback, useEffect, useRef, useState } from 'react';

/**
 * Width of an element, kept current with a ResizeObserver. Returns a callback ref
 * for the element and its content width in CSS pixels (0 until measured).
 *
 * The first width comes from the observer's first report, which the browser delivers after its
 * own layout and before painting: reading the width as React attaches the element would force a
 * layout of the whole page in the middle of React's commit, once per chart. Without a
 * ResizeObserver (some test environments) the width is read at once.
 */
export function useElementWidth<T extends HTMLElement>(): [(node: T | null) => void, number] {
  const [width, setWidth] = useState(0);
  const observer = useRef<ResizeObserver | null>(null);

  const ref = useCallback((node: T | null) => {
    observer.current?.disconnect();
    observer.current = null;
    if (!node) return;
    if (typeof ResizeObserver === 'undefined') {
      setWidth(Math.floor(node.getBoundingClientRect().width));
      return;
    }
    observer.current = new ResizeObserver((entries) => {
      const entry = entries[0];
      if (entry) setWidth(Math.floor(entry.contentRect.width));
    });
    observer.current.observe(node);
  }, []);

  useEffect(() => () => observer.current?.disconnect(), []);
  return [ref, width];
}
