'use client';
import { fetchJson } from '@/lib/api/client';
import { DownloadButton } from '@/components/files/download-button';

/**
 * Exports the run (its cell document, event log and grade summary, as this reader may see
 * them) to a JSON archive and downloads it, through the run's own checks.
 */
export function RunArchiveButton({ runId }: { runId: string }) {
  return (
    <DownloadButton
      label="Download run archive"
      prepare={async () => (await fetchJson<{ archive: { url: string } }>(`/api/runs/${runId}/archive`, { method: 'POST' })).archive.url}
      fallbackName={`run-${runId.slice(0, 8)}.json`}
      waitingNote="Preparing the archive…"
      testId="download-run-archive"
    />
  );
}
