/**
 * The report of a drill regrade job (lib/drills/regrade-job.ts), shared with the drill page:
 * every submitted run of the drill re-simulated from its stored log and compared with the
 * grade and trace hash stored at submission. A regrade checks that the server's grading is
 * reproducible; it never changes a stored grade.
 */

/** One side of a comparison: what was stored at submission, or what the server computes now. */
export interface RegradeSide {
  grade: number | null;
  traceHash: string | null;
}

export interface RegradeDifference {
  runId: string;
  student: string;
  stored: RegradeSide;
  now: RegradeSide;
  /** The per-rule breakdown differs (grade and hash may still agree). */
  breakdownChanged: boolean;
}

export interface DrillRegradeReport {
  drillId: string;
  /** Submitted runs checked. */
  runs: number;
  /** Runs whose grade, breakdown and trace hash came out the same. */
  matched: number;
  differed: RegradeDifference[];
  /** Runs that could not be re-simulated at all, with why. */
  failed: { runId: string; student: string; error: string }[];
  checkedAt: string;
}

/** The payload a drill regrade job is queued with. */
export interface DrillRegradePayload {
  drillId: string;
}
