import Link from 'next/link';
import { Notice } from '@/components/ui/notice';

const TEXT: Record<string, string> = {
  invalid: 'This link is not valid. Check that you copied the whole address.',
  used: 'This link was already used. Each link works once.',
  expired: 'This link has expired.',
  revoked: 'This invitation was withdrawn.',
};

/** A clear page for an unusable token; nothing about any account changes. */
export function LinkProblem({ state, next }: { state: string; next: { href: string; label: string } }) {
  return (
    <div className="space-y-4" data-testid="link-problem">
      <Notice tone="error">{TEXT[state] ?? TEXT.invalid}</Notice>
      <Link href={next.href} className="inline-block text-sm font-medium text-accent-700 hover:underline">
        {next.label}
      </Link>
    </div>
  );
}
