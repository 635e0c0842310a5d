import 'server-only';
import type { JobHandler } from './handler';
import type { JobKind } from './types';

// The handler types live in ./handler.ts, which the handlers import: this table imports the
// handlers (lazily), so the types cannot live here without an import circle.
export type { JobContext, JobHandler } from './handler';

/**
 * Kind → handler, imported lazily so that the worker loads only the code of the kinds it
 * runs, and so this table stays a cheap import. scripts/worker.ts works every kind listed.
 * A new kind: one line here, its settings in lib/jobs/settings.ts.
 */
export const JOB_HANDLERS: Partial<Record<JobKind, () => Promise<JobHandler>>> = {
  'drill-regrade': async () => (await import('@/lib/drills/regrade-job')).drillRegradeJob,
  'changeover-proofs': async () => (await import('@/lib/changeovers/jobs')).changeoverProofsJob,
  'changeover-checks': async () => (await import('@/lib/changeovers/jobs')).changeoverChecksJob,
  'changeover-report': async () => (await import('@/lib/reports/changeover-report-job')).changeoverReportJob,
};
