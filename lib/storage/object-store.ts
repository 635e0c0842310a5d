import { createHash } from 'node:crypto';
import { DeleteObjectCommand, GetObjectCommand, HeadObjectCommand, NoSuchKey, NotFound, PutObjectCommand, S3Client, S3ServiceException } from '@aws-sdk/client-s3';
import { env, type Env } from '@/lib/env';

/**
 * Files kept where a hosted deployment keeps them: a bucket behind the S3 API (issue #13).
 * Drill images, printed changeover reports and run archives go through here; the database
 * keeps each file's key, type, size and SHA-256. The bucket is never public: every download is
 * a route of the app that checks the reader first and passes the object through.
 *
 * Not `server-only`: the migration that moved the images out of PostgreSQL and the scripts
 * run it under plain tsx. It never reaches the browser (nothing on the client imports it).
 */

/** How to reach the bucket, from lib/env.ts. */
export interface StorageSettings {
  endpoint: string | undefined;
  bucket: string;
  region: string;
  credentials: { accessKeyId: string; secretAccessKey: string } | undefined;
  forcePathStyle: boolean;
}

export function storageSettings(e: Env = env()): StorageSettings {
  return {
    endpoint: e.S3_ENDPOINT,
    bucket: e.S3_BUCKET,
    region: e.S3_REGION,
    credentials: e.S3_ACCESS_KEY_ID && e.S3_SECRET_ACCESS_KEY ? { accessKeyId: e.S3_ACCESS_KEY_ID, secretAccessKey: e.S3_SECRET_ACCESS_KEY } : undefined,
    forcePathStyle: e.S3_FORCE_PATH_STYLE,
  };
}

/** A stored object's facts as the app records them. */
export interface StoredObject {
  key: string;
  sizeBytes: number;
  /** Lower-case hex SHA-256 of the bytes. */
  sha256: string;
  contentType: string;
}

/** An object being read: its body as a web stream (hand it to a Response), its type and length. */
export interface ObjectStream {
  body: ReadableStream<Uint8Array>;
  contentType: string | undefined;
  sizeBytes: number | undefined;
}

export interface ObjectStore {
  readonly bucket: string;
  /** Writes `bytes` under `key` (replacing any object there) and answers what was stored. */
  put(key: string, bytes: Uint8Array, contentType: string): Promise<StoredObject>;
  /** The object as a stream, or null when there is none under `key`. */
  open(key: string): Promise<ObjectStream | null>;
  /** The whole object in memory, or null (small files only: images, the archive a test reads back). */
  read(key: string): Promise<Buffer | null>;
  /** Whether an object is there. */
  exists(key: string): Promise<boolean>;
  /** Removes the object; removing a missing one is not an error (S3's own rule). */
  remove(key: string): Promise<void>;
  /** Closes the client's connections (scripts, tests). */
  close(): void;
}

export function sha256Hex(bytes: Uint8Array): string {
  return createHash('sha256').update(bytes).digest('hex');
}

function isMissing(err: unknown): boolean {
  if (err instanceof NoSuchKey || err instanceof NotFound) return true;
  return err instanceof S3ServiceException && (err.$metadata.httpStatusCode === 404 || err.name === 'NoSuchKey' || err.name === 'NotFound');
}

/** A key is ours to build: no leading slash, no `..`, printable ASCII only (keys are made from ids, never from user text). */
function checkKey(key: string): string {
  if (!/^[A-Za-z0-9][A-Za-z0-9._/-]{0,511}$/.test(key) || key.includes('..') || key.includes('//')) throw new Error(`not an object key: ${JSON.stringify(key)}`);
  return key;
}

/** A store on the bucket `settings` names (its own S3 client). */
export function createObjectStore(settings: StorageSettings = storageSettings()): ObjectStore {
  const client = new S3Client({
    endpoint: settings.endpoint,
    region: settings.region,
    credentials: settings.credentials,
    forcePathStyle: settings.forcePathStyle,
    // Checksums only where an operation needs one: with the SDK's default (a CRC32 trailer on
    // every upload, aws-chunked), S3 fakes store the chunk framing inside the object
    // (../shared/TOOLCHAIN.md, s3rver row). Integrity is ours instead: Content-MD5 on upload,
    // which S3 and the fakes check, and the SHA-256 the database keeps.
    requestChecksumCalculation: 'WHEN_REQUIRED',
    responseChecksumValidation: 'WHEN_REQUIRED',
    maxAttempts: 3,
  });
  const bucket = settings.bucket;

  return {
    bucket,
    async put(key, bytes, contentType) {
      const sha256 = sha256Hex(bytes);
      await client.send(
        new PutObjectCommand({
          Bucket: bucket,
          Key: checkKey(key),
          Body: bytes,
          ContentType: contentType,
          ContentLength: bytes.byteLength,
          ContentMD5: createHash('md5').update(bytes).digest('base64'),
          Metadata: { sha256 },
        }),
      );
      return { key, sizeBytes: bytes.byteLength, sha256, contentType };
    },
    async open(key) {
      try {
        const out = await client.send(new GetObjectCommand({ Bucket: bucket, Key: checkKey(key) }));
        if (!out.Body) return null;
        return { body: out.Body.transformToWebStream() as ReadableStream<Uint8Array>, contentType: out.ContentType, sizeBytes: out.ContentLength };
      } catch (err) {
        if (isMissing(err)) return null;
        throw err;
      }
    },
    async read(key) {
      try {
        const out = await client.send(new GetObjectCommand({ Bucket: bucket, Key: checkKey(key) }));
        return out.Body ? Buffer.from(await out.Body.transformToByteArray()) : null;
      } catch (err) {
        if (isMissing(err)) return null;
        throw err;
      }
    },
    async exists(key) {
      try {
        await client.send(new HeadObjectCommand({ Bucket: bucket, Key: checkKey(key) }));
        return true;
      } catch (err) {
        if (isMissing(err)) return false;
        throw err;
      }
    },
    async remove(key) {
      await client.send(new DeleteObjectCommand({ Bucket: bucket, Key: checkKey(key) }));
    },
    close() {
      client.destroy();
    },
  };
}

const globalForStore = globalThis as unknown as { cellwrightObjectStore?: ObjectStore };

/** The app's one store, cached on globalThis like the Knex instance (one connection pool across hot reloads). */
export function objectStore(): ObjectStore {
  globalForStore.cellwrightObjectStore ??= createObjectStore();
  return globalForStore.cellwrightObjectStore;
}

/** Drops the cached store (tests that change the settings, scripts that finish). */
export function closeObjectStore(): void {
  globalForStore.cellwrightObjectStore?.close();
  globalForStore.cellwrightObjectStore = undefined;
}
