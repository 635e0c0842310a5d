import { SafetyCaution } from '@/components/ui/safety-caution';
import { CHANGEOVER_CAUTION_LINES } from '@/lib/cautions';

/** The caution on every changeover page: the standard one and what a proof does not cover (lib/cautions.ts). */
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
