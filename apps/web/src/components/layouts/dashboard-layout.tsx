import type { ReactNode } from 'react';
import { Link, NavLink } from 'react-router-dom';
import type { NavigationItem } from '../../config/navigation.ts';
import { paths } from '../../config/paths.ts';
import { cn } from '../../lib/cn.ts';
import { BrandMark } from './brand-mark.tsx';
import { SafetyNote } from './safety-note.tsx';

/**
 * Signed-in pages: header (brand, navigation, user slot), the page, and the safety note.
 * The page area fills the viewport so long lists scroll inside it and the note stays in view.
 */
export function DashboardLayout({
  navigation,
  user,
  timeZone,
  children,
}: {
  navigation: readonly NavigationItem[];
  user: ReactNode;
  /** The zone the page's times are in (unless the page names a site's own). */
  timeZone: string;
  children: ReactNode;
}) {
  return (
    <div className="flex h-dvh flex-col">
      <a
        href="#main"
        className="sr-only z-50 rounded-md bg-surface px-3 py-2 text-sm focus:not-sr-only focus:fixed focus:top-2 focus:left-2"
      >
        Skip to content
      </a>
      <header className="border-b border-line bg-surface">
        <div className="flex flex-wrap items-center gap-x-6 gap-y-1 px-4 sm:px-6">
          <Link
            to={paths.home.getHref()}
            className="flex h-14 items-center gap-2.5 rounded-md text-ink"
            aria-label="Turnstone home"
          >
            <BrandMark />
            <span className="text-[15px] font-semibold tracking-tight">Turnstone</span>
          </Link>
          <nav
            aria-label="Main"
            className="order-last -mx-2 w-full overflow-x-auto lg:order-none lg:mx-0 lg:w-auto lg:flex-1"
          >
            <ul className="flex h-11 items-stretch gap-1 lg:h-14">
              {navigation.map((item) => (
                <li key={item.to} className="flex">
                  <NavLink
                    to={item.to}
                    className={({ isActive }) =>
                      cn(
                        'relative flex items-center rounded-md px-2.5 text-sm font-medium transition-colors',
                        isActive
                          ? 'text-accent after:absolute after:inset-x-2.5 after:bottom-0 after:h-0.5 after:rounded-full after:bg-accent'
                          : 'text-ink-muted hover:text-ink',
                      )
                    }
                  >
                    {item.label}
                  </NavLink>
                </li>
              ))}
            </ul>
          </nav>
          <div className="ml-auto flex h-14 items-center">{user}</div>
        </div>
      </header>
      <main
        id="main"
        tabIndex={-1}
        className="flex min-h-0 flex-1 flex-col overflow-y-auto focus:outline-none"
      >
        {children}
      </main>
      <SafetyNote timeZone={timeZone} />
    </div>
  );
}
