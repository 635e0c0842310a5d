import 'server-only';
import { objectStore } from './object-store';

/**
 * A download answered by the app from the bucket: the object's bytes stream through the route
 * (which has checked the reader first); the bucket itself is never reachable from outside.
 */
export interface Download {
  objectKey: string;
  contentType: string;
  /** Offered to save as; ASCII letters, digits, dots, hyphens and underscores only. */
  fileName: string;
  /** True for files that never change once made (the report of a signed record, an archive named by its hash). */
  immutable: boolean;
}

/**
 * The Response for a download, streaming the object. `private`: only the browser that asked may
 * keep it, never a shared cache, since the route checked who asked. A missing object is a
 * server fault (its row says it is there) and throws.
 */
export async function downloadResponse(d: Download): Promise<Response> {
  const object = await objectStore().open(d.objectKey);
  if (!object) throw new Error(`object ${d.objectKey} is missing from the bucket`);
  const headers: Record<string, string> = {
    'content-type': d.contentType,
    'content-disposition': `attachment; filename="${d.fileName.replace(/[^\w.-]/g, '_')}"`,
    'cache-control': d.immutable ? 'private, max-age=3600' : 'private, no-store',
    'x-content-type-options': 'nosniff',
  };
  if (object.sizeBytes !== undefined) headers['content-length'] = String(object.sizeBytes);
  return new Response(object.body, { status: 200, headers });
}
