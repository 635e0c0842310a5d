/**
 * Where each kind of file lives in the bucket. Keys are built from ids only (never from a file
 * name a user typed), so they are always valid and never collide across kinds.
 */

/** A brief image: one object per asset row. */
export function drillAssetKey(drillId: string, assetId: string): string {
  return `drill-assets/${drillId.toLowerCase()}/${assetId.toLowerCase()}`;
}

/** The printed report of a signed-off changeover: one per changeover, as the record never changes. */
export function changeoverReportKey(changeoverId: string): string {
  return `changeover-reports/${changeoverId.toLowerCase()}.pdf`;
}

/** An exported run archive, named by its content's SHA-256: exporting the same content twice writes the same object. */
export function runArchiveKey(runId: string, sha256: string): string {
  return `run-archives/${runId.toLowerCase()}/${sha256}.json`;
}
