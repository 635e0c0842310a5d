/** Builds the worker-thread bundles: the engine's and a PLC link's (lib/workers/bundle.ts says why they are separate). */
import { buildBundle, ENGINE_WORKER, PLC_LINK_WORKER } from '../lib/workers/bundle';

for (const b of [ENGINE_WORKER, PLC_LINK_WORKER]) console.log(`worker bundle: ${buildBundle(b)}`);
