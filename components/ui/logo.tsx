/** Cellwright's mark alone: a cell outline with one live link. */
export function LogoMark({ className }: { className?: string }) {
  return (
    <svg aria-hidden viewBox="0 0 24 24" className={className ?? 'h-6 w-6'} fill="none">
      <rect x="3" y="3" width="18" height="18" rx="3" stroke="currentColor" strokeWidth="1.6" className="text-slate-500" />
      <circle cx="8" cy="12" r="2" className="fill-accent-600" />
      <circle cx="16" cy="12" r="2" className="fill-accent-600" />
      <path d="M10 12h4" stroke="#0f7874" strokeWidth="2.4" strokeLinecap="round" />
    </svg>
  );
}

/** Cellwright's mark and name. */
export function Logo({ className }: { className?: string }) {
  return (
    <span className={`inline-flex items-center gap-2 font-semibold tracking-tight ${className ?? ''}`}>
      <LogoMark />
      Cellwright
    </span>
  );
}
