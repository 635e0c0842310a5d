'use client';

import Link from 'next/link';
import { usePathname } from 'next/navigation';
import { Boxes, Cable, ClipboardCheck, GitCompareArrows, History, Inbox, LayoutDashboard, Target, Users, UsersRound } from 'lucide-react';
import type { NavItem } from '@/lib/roles';
import { cn } from './cn';

const ICONS = { dashboard: LayoutDashboard, cells: Boxes, cohorts: UsersRound, users: Users, mailbox: Inbox, drills: Target, runs: History, gradebook: ClipboardCheck, changeovers: GitCompareArrows, plcLink: Cable } as const;

/**
 * The role's navigation; the current area is marked with the accent and aria-current. In the
 * collapsed sidebar the labels are visually hidden (`labelClassName`) but stay the links' names.
 */
export function AppNav({ items, id, labelClassName, onNavigate }: { items: NavItem[]; id?: string; labelClassName?: string; onNavigate?: () => void }) {
  const pathname = usePathname();
  return (
    <nav aria-label="Main" id={id} className="flex flex-col gap-1">
      {items.map((item) => {
        const Icon = ICONS[item.icon];
        const active = pathname === item.href || pathname.startsWith(`${item.href}/`);
        return (
          <Link
            key={item.href}
            href={item.href}
            title={item.label}
            onClick={onNavigate}
            aria-current={active ? 'page' : undefined}
            className={cn(
              'flex items-center gap-2 rounded-md px-3 py-2 text-sm font-medium',
              active ? 'bg-accent-50 text-accent-800 ring-1 ring-accent-200' : 'text-slate-700 hover:bg-slate-100',
            )}
          >
            <Icon aria-hidden className="h-4 w-4 shrink-0" />
            <span className={labelClassName}>{item.label}</span>
          </Link>
        );
      })}
    </nav>
  );
}
