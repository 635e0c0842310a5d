/** Builds the engine's worker-thread bundle (lib/runs/worker-bundle.ts says why it is separate). */
import { buildWorkerBundle } from '../lib/runs/worker-bundle';

const out = buildWorkerBundle();
console.log(`engine worker bundle: ${out}`);
