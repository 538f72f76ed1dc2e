import { useState } from 'react';
import { NavLink, Outlet, useLocation } from 'react-router-dom';
import { CautionScope } from '../components/ui/caution';
import { paths } from '../config/paths';
import { navItems } from './nav';
import { SessionSlot } from './session-slot';

const linkClass = ({ isActive }: { isActive: boolean }) =>
  `rounded px-2.5 py-1.5 ${isActive ? 'bg-ink-700 text-white' : 'text-slate-300 hover:bg-ink-800 hover:text-white'}`;

export function AppLayout() {
  // On narrow screens the main links fold into a menu; sign-in and the account stay in the bar.
  // Following a link closes the menu (state adjusted during render when the path changes, not in an effect).
  const [menuOpen, setMenuOpen] = useState(false);
  const location = useLocation();
  const [menuPath, setMenuPath] = useState(location.pathname);
  if (menuPath !== location.pathname) {
    setMenuPath(location.pathname);
    setMenuOpen(false);
  }
  return (
    <div className="flex min-h-screen flex-col">
      <a
        href="#main"
        className="sr-only focus:not-sr-only focus:absolute focus:left-2 focus:top-2 focus:rounded focus:bg-white focus:px-3 focus:py-1"
      >
        Skip to content
      </a>
      <header className="border-b border-ink-800 bg-ink-900 text-slate-100">
        <div className="mx-auto flex max-w-7xl items-center gap-3 px-4 py-2.5 sm:px-6 md:gap-6">
          <NavLink to={paths.home.getHref()} className="flex items-center gap-2 text-lg font-semibold tracking-tight">
            <svg aria-hidden="true" viewBox="0 0 16 16" className="h-5 w-5">
              <path d="M1.5 13.5 L8 2.5 L14.5 13.5 Z" fill="none" stroke="#5eead4" strokeWidth="1.5" />
              <path d="M5 13.5 L8 8 L11 13.5" fill="#5eead4" />
            </svg>
            Eyrie
          </NavLink>
          <nav aria-label="Main" className="hidden flex-1 gap-1 text-sm md:flex">
            {navItems.map((item) => (
              <NavLink key={item.to} to={item.to} end={item.end} className={linkClass}>
                {item.label}
              </NavLink>
            ))}
          </nav>
          <div className="flex-1 md:hidden" />
          <button
            type="button"
            className="rounded border border-slate-500 px-2.5 py-1 text-sm text-slate-100 hover:bg-ink-800 md:hidden"
            aria-expanded={menuOpen}
            aria-controls="main-menu"
            onClick={() => setMenuOpen((o) => !o)}
          >
            <span aria-hidden="true">{menuOpen ? '✕' : '☰'} </span>Menu
          </button>
          <SessionSlot />
        </div>
        {menuOpen && (
          <nav id="main-menu" aria-label="Main" className="border-t border-ink-800 px-4 py-2 text-sm md:hidden">
            <ul className="flex flex-col gap-1">
              {navItems.map((item) => (
                <li key={item.to} className="flex">
                  <NavLink to={item.to} end={item.end} className={(s) => `${linkClass(s)} flex-1`}>
                    {item.label}
                  </NavLink>
                </li>
              ))}
            </ul>
          </nav>
        )}
      </header>
      <main id="main" className="flex-1">
        <CautionScope key={location.pathname}>
          <Outlet />
        </CautionScope>
      </main>
      <footer className="border-t border-slate-200 bg-white py-3 text-center text-xs text-ink-500">
        Eyrie · forecasts are model estimates, to be confirmed by experiment
      </footer>
    </div>
  );
}
