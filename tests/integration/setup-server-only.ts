import { vi } from 'vitest';
import { applyTestEnv } from './test-env';

// db/*.ts and lib/**/server code start with `import 'server-only'`, which throws
// outside a React Server Components bundler. Tests run in plain Node: make it empty.
vi.mock('server-only', () => ({}));

applyTestEnv();
