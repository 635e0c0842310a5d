/** A run as the runs API returns it (lib/runs/access.ts `runView`). */
export type RunInfo = {
  id: string;
  userId: string;
  userName: string;
  mode: 'drill' | 'practice';
  drillId: string | null;
  assignmentId: string | null;
  cellId: string;
  cellVersion: number;
  status: 'active' | 'submitted';
  startedAt: string;
  submittedAt: string | null;
  endedMs: number | null;
  lastSeq: number;
  untilMs: number;
  diagnosis: { kind: string; location: string; note?: string } | null;
  grade: number | null;
  computedGrade: number | null;
  overridden: boolean;
  overrideReason: string | null;
  traceHash: string | null;
  seed?: number;
  breakdown: RunBreakdown | null;
};

export type RunBreakdown = {
  rules: { id: string; label: string | null; kind: string; weight: number; status: 'pass' | 'fail' | 'inconclusive'; earned: number; violation: { timeMs: number; message: string; values: Record<string, unknown> } | null }[];
  diagnosis: { weight: number; earned: number; kindCorrect: boolean; locationCorrect: boolean; given: { kind: string; location: string } | null };
  earned: number;
  possible: number;
  endedMs: number;
};
