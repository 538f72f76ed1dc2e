import { startTransition, useEffect, useState, type ReactNode } from 'react';

/**
 * Content that is not read on arrival (a long page's lower panels, a table below the charts)
 * mounts once the browser is idle after the page's first paint, one piece per idle period, in
 * document order, each in a transition: React builds each in short slices between the browser's
 * frames, and each commits on its own, so no piece joins the page's first long task and no two
 * pieces make one long commit together. Waiting for idle time (at most a second per piece) keeps
 * their builds, and any requests they make, out of the way of what the page is opened for.
 */
export function AfterFirstPaint({ children }: { children: ReactNode }) {
  const [shown, setShown] = useState(false);
  useEffect(() => {
    const show = () => setShown(true);
    waiting.push(show);
    scheduleNext();
    return () => {
      const at = waiting.indexOf(show);
      if (at >= 0) waiting.splice(at, 1);
    };
  }, []);
  return shown ? children : null;
}

/** Pieces waiting to be shown, in the order they mounted (effects run in document order). */
const waiting: (() => void)[] = [];
let scheduled = false;

function scheduleNext() {
  if (scheduled || waiting.length === 0) return;
  scheduled = true;
  const next = () => {
    scheduled = false;
    const show = waiting.shift();
    if (show) startTransition(show);
    // The next piece waits for the browser's next idle period, which comes once React has built and
    // committed this one (its slices keep the main thread busy until then).
    scheduleNext();
  };
  if (typeof requestIdleCallback === 'undefined') setTimeout(next, 1);
  else requestIdleCallback(next, { timeout: 1000 });
}
