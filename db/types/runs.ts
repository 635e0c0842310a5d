import type { checkRules } from '@/simulator';
import type { Diagnosis } from './drills';

/** A run's stored grade breakdown, as lib/runs/grade.ts computes it and db/runs.ts keeps it. See db/types/users.ts for why here. */

type RuleResult = Extract<ReturnType<typeof checkRules>, { ok: true }>['value'][number];

export interface RuleScore {
  id: string;
  label: string | null;
  kind: RuleResult['kind'];
  weight: number;
  status: RuleResult['status'];
  earned: number;
  violation: RuleResult['violation'] | null;
}

export interface DiagnosisScore {
  weight: number;
  earned: number;
  kindCorrect: boolean;
  locationCorrect: boolean;
  given: Diagnosis | null;
}

/** How a grade came about: per rule, the diagnosis, and the totals. */
export interface GradeBreakdown {
  rules: RuleScore[];
  diagnosis: DiagnosisScore;
  earned: number;
  possible: number;
  endedMs: number;
}
