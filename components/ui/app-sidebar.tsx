'use client';

import Link from 'next/link';
import { useCallback, useEffect, useId, useState, useSyncExternalStore } from 'react';
import { PanelLeftClose, PanelLeftOpen } from 'lucide-react';
import type { NavItem } from '@/lib/roles';
import { AppNav } from './app-nav';
import { Logo, LogoMark } from './logo';
import { cn } from './cn';

/** From this width (Tailwind's `lg`, 1024 px) the sidebar is open by default and sits beside the page. */
const WIDE_QUERY = '(min-width: 1024px)';
/** The reader's own choice, kept for the next page and visit. */
const STORAGE_KEY = 'cellwright.sidebar';

function subscribeWide(onChange: () => void): () => void {
  const query = window.matchMedia(WIDE_QUERY);
  query.addEventListener('change', onChange);
  return () => query.removeEventListener('change', onChange);
}

/**
 * The signed-in navigation: a full sidebar on wide screens, a rail of icons below 1024 px (a
 * tablet, or a laptop window beside a drill brief), so the page keeps the width it needs. The
 * toggle is a real button with `aria-expanded`; opened on a narrow screen the sidebar lies over
 * the page and Escape, a link or the toggle closes it.
 */
export function AppSidebar({ items }: { items: NavItem[] }) {
  const navId = useId();
  // The server renders as if wide; the CSS classes below give the right first paint either way.
  const wide = useSyncExternalStore(subscribeWide, () => window.matchMedia(WIDE_QUERY).matches, () => true);
  const [choice, setChoice] = useState<'open' | 'closed' | null>(null);
  useEffect(() => {
    const saved = window.localStorage.getItem(STORAGE_KEY);
    // A stored choice is read after mount (localStorage does not exist on the server).
    // eslint-disable-next-line react-hooks/set-state-in-effect
    if (saved === 'open' || saved === 'closed') setChoice(saved);
  }, []);

  const open = choice === null ? wide : choice === 'open';
  const overlay = open && !wide;
  const toggle = useCallback(() => {
    const next = open ? 'closed' : 'open';
    setChoice(next);
    // On a narrow screen an opened sidebar is a passing overlay: only wide-screen choices are kept.
    if (wide) window.localStorage.setItem(STORAGE_KEY, next);
  }, [open, wide]);

  useEffect(() => {
    if (!overlay) return;
    const onKey = (e: KeyboardEvent) => {
      if (e.key === 'Escape') setChoice('closed');
    };
    window.addEventListener('keydown', onKey);
    return () => window.removeEventListener('keydown', onKey);
  }, [overlay]);

  // Before the reader chooses, CSS decides (rail below lg, full from lg), so the first paint is right.
  const auto = choice === null;
  const labelled = auto ? 'max-lg:sr-only' : open ? '' : 'sr-only';
  return (
    <div className={cn('shrink-0 print:hidden', auto ? 'w-14 lg:w-60' : open && wide ? 'w-60' : 'w-14')} data-testid="sidebar" data-open={open}>
      <div
        className={cn(
          'fixed inset-y-0 left-0 z-40 flex flex-col gap-4 overflow-y-auto border-r border-slate-200 bg-white px-2 py-3',
          auto ? 'w-14 lg:w-60 lg:px-3' : open ? 'w-60 px-3' : 'w-14',
          overlay && 'shadow-xl',
        )}
      >
        <div className={cn('flex items-center gap-2', auto ? 'flex-col lg:flex-row lg:justify-between' : open ? 'justify-between' : 'flex-col')}>
          <Link href="/dashboard" className="rounded-md text-slate-900" aria-label="Cellwright — dashboard">
            <span className={cn(auto ? 'max-lg:hidden' : !open && 'hidden')}>
              <Logo />
            </span>
            <span className={cn(auto ? 'lg:hidden' : open && 'hidden')}>
              <LogoMark />
            </span>
          </Link>
          <button
            type="button"
            onClick={toggle}
            aria-expanded={open}
            aria-controls={navId}
            className="inline-flex h-9 w-9 items-center justify-center rounded-md text-slate-700 hover:bg-slate-100 focus-visible:outline-2 focus-visible:outline-offset-2 focus-visible:outline-accent-600"
            data-testid="sidebar-toggle"
          >
            {open ? <PanelLeftClose aria-hidden className="h-5 w-5" /> : <PanelLeftOpen aria-hidden className="h-5 w-5" />}
            <span className="sr-only">{open ? 'Collapse the navigation' : 'Expand the navigation'}</span>
          </button>
        </div>
        <AppNav id={navId} items={items} labelClassName={labelled} onNavigate={overlay ? () => setChoice('closed') : undefined} />
      </div>
      {overlay ? <div aria-hidden className="fixed inset-0 z-30 bg-slate-900/20" onClick={() => setChoice('closed')} /> : null}
    </div>
  );
}
