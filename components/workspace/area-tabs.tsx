'use client';
/**
 * The six workspace areas and their tab strip, shared by the cell workspace and the run
 * workspaces (drill attempt, practice, preview): one list of areas, one keyboard behaviour
 * (arrow keys move the selection and the focus, as the WAI-ARIA tabs pattern asks).
 */
import { useRef, type KeyboardEvent, type ReactNode } from 'react';
import { Activity, Cable, Cpu, LayoutPanelTop, Network, SlidersHorizontal } from 'lucide-react';
import { cn } from '@/components/ui/cn';

export const WORKSPACE_AREAS = [
  { id: 'panel', label: 'Panel', icon: LayoutPanelTop },
  { id: 'field', label: 'Field', icon: Cable },
  { id: 'logic', label: 'Logic', icon: Network },
  { id: 'controller', label: 'Controller', icon: Cpu },
  { id: 'monitor', label: 'Monitor', icon: SlidersHorizontal },
  { id: 'scope', label: 'Scope', icon: Activity },
] as const;

export type AreaId = (typeof WORKSPACE_AREAS)[number]['id'];

export function AreaTabs({
  area,
  onSelect,
  badge,
  trailing,
}: {
  area: AreaId;
  onSelect: (id: AreaId) => void;
  /** Extra words after a tab's label (e.g. "read-only"). */
  badge?: (id: AreaId) => ReactNode;
  /** Shown at the right end of the strip. */
  trailing?: ReactNode;
}) {
  const tabRefs = useRef<Partial<Record<AreaId, HTMLButtonElement | null>>>({});
  const onTabKey = (e: KeyboardEvent<HTMLButtonElement>, index: number) => {
    const delta = e.key === 'ArrowRight' ? 1 : e.key === 'ArrowLeft' ? -1 : 0;
    if (!delta) return;
    e.preventDefault();
    const next = WORKSPACE_AREAS[(index + delta + WORKSPACE_AREAS.length) % WORKSPACE_AREAS.length];
    onSelect(next.id);
    tabRefs.current[next.id]?.focus();
  };
  return (
    <div role="tablist" aria-label="Workspace areas" className="flex flex-wrap gap-1 border-b border-slate-300">
      {WORKSPACE_AREAS.map((a, i) => {
        const Icon = a.icon;
        const selected = area === a.id;
        return (
          <button
            key={a.id}
            ref={(el) => {
              tabRefs.current[a.id] = el;
            }}
            type="button"
            role="tab"
            id={`tab-${a.id}`}
            aria-selected={selected}
            aria-controls={`area-${a.id}`}
            tabIndex={selected ? 0 : -1}
            onClick={() => onSelect(a.id)}
            onKeyDown={(e) => onTabKey(e, i)}
            className={cn(
              '-mb-px inline-flex items-center gap-1.5 rounded-t-md border px-3 py-2 text-sm',
              selected ? 'border-slate-300 border-b-white bg-white font-semibold text-accent-800' : 'border-transparent text-slate-600 hover:text-slate-900',
            )}
          >
            <Icon aria-hidden className="h-4 w-4" />
            {a.label}
            {badge?.(a.id)}
          </button>
        );
      })}
      {trailing}
    </div>
  );
}
