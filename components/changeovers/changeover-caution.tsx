import { SafetyCaution } from '@/components/ui/safety-caution';

/**
 * The caution on every changeover page and on the printed record (issue #10): what a proof does
 * not cover, and that the change still goes through the site's own management of change
 * (common practice; e.g. the change procedures ISO 13849-2 validation and OSHA 29 CFR
 * 1910.119 describe). Always on top of the standard safety caution, never instead of it.
 */
export const CHANGEOVER_CAUTION_LINES = [
  'A proof covers the modelled logic only — not the wiring, the field devices or the safety-rated circuits of the real cell.',
  'Simulated interlocks are not safety functions; a signed record here is a rehearsal, not an approval to work on equipment.',
  'The change still goes through the site’s management-of-change procedure, lockout/tagout, local codes and licensed practice.',
] as const;

export function ChangeoverCaution({ compact = false, className }: { compact?: boolean; className?: string }) {
  return (
    <SafetyCaution compact={compact} className={className}>
      <ul className="list-disc space-y-0.5 pl-4" data-testid="changeover-caution">
        {CHANGEOVER_CAUTION_LINES.map((line) => (
          <li key={line}>{line}</li>
        ))}
      </ul>
    </SafetyCaution>
  );
}
