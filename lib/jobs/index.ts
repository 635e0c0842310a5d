import 'server-only';

/**
 * The job queue for server code: enqueue, read and list jobs, and the types. Browser code
 * imports `@/lib/jobs/types` instead (this entry is server-only). The worker's own pieces
 * (lib/jobs/worker.ts, registry.ts) are imported by their users directly.
 */
export { enqueueJob, getJob, listJobs, MAX_PAYLOAD_BYTES, type EnqueueOverrides } from './queue';
export { assertCanReadSubject, canReadSubject, jobForReader, SUBJECT_READERS, type SubjectReader } from './access';
export { PermanentJobError } from './errors';
export type { JobContext, JobHandler } from './handler';
export { JOB_KINDS, JOB_STATES, isFinished, parseSubject, subjectOf, type JobEvent, type JobKind, type JobProgress, type JobRecord, type JobState } from './types';
