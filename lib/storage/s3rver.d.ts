/**
 * Types for the part of s3rver 3.7 that scripts/object-store.ts uses (the package ships none).
 * Names and behaviour follow s3rver's README and lib/s3rver.js.
 */
declare module 's3rver' {
  interface S3rverOptions {
    address?: string;
    port?: number;
    directory?: string;
    silent?: boolean;
    resetOnClose?: boolean;
    allowMismatchedSignatures?: boolean;
    vhostBuckets?: boolean;
    configureBuckets?: { name: string; configs?: (string | Buffer)[] }[];
  }

  class S3rver {
    constructor(options?: S3rverOptions);
    /** Creates the configured buckets, then listens; answers the bound address. */
    run(): Promise<{ address: string; port: number }>;
    close(): Promise<void>;
    /** Empties every bucket and forgets them. */
    reset(): void;
  }

  export default S3rver;
}
