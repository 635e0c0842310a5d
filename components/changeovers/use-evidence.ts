'use client';
import { useMemo } from 'react';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { fetchJson } from '@/lib/api/client';
import { bitSignalOptions, engineTraceOptions, type SignalOption } from '@/components/rules/signal-catalogue';
import type { CellDocument } from '@/simulator';
import type { EvidenceDetail } from '@/lib/changeovers/evidence';
import type { StoredInterlockRule } from '@/db/interlock-rules';
import type { ScenarioSummary } from '@/db/scenarios';

/** What GET /api/changeovers/[id]/evidence answers. */
export type EvidenceResponse = {
  changeover: { id: string; cellId: string; state: string; baseVersion: number; proposedVersion: number; pinnedVersion: number | null; signedBy: { id: string; name: string } | null };
  canEdit: boolean;
  evidence: EvidenceDetail;
  rules: StoredInterlockRule[];
  scenarios: ScenarioSummary[];
};

export type DocumentsResponse = { baseVersion: number; proposedVersion: number; base: CellDocument; proposed: CellDocument };

export const evidenceKey = (id: string) => ['changeover-evidence', id] as const;

/**
 * The changeover's evidence, shared by the proofs and the checks sections (one query). While a
 * job runs it is read again every second and a half, so progress shows even where the job
 * stream is not available; the stream, when it reports, refreshes it at once.
 */
export function useEvidence(changeoverId: string) {
  return useQuery({
    queryKey: evidenceKey(changeoverId),
    queryFn: () => fetchJson<EvidenceResponse>(`/api/changeovers/${changeoverId}/evidence`),
    refetchInterval: (q) => {
      const open = q.state.data?.evidence.open;
      return open && (open.proofs || open.checks) ? 1500 : false;
    },
  });
}

/** Base and proposal documents (fixed per pair of versions, so read once). */
export function useChangeoverDocuments(changeoverId: string, versions: { baseVersion: number; proposedVersion: number } | undefined) {
  return useQuery({
    queryKey: ['changeover-documents', changeoverId, versions?.baseVersion, versions?.proposedVersion],
    queryFn: () => fetchJson<DocumentsResponse>(`/api/changeovers/${changeoverId}/documents`),
    enabled: Boolean(versions),
    staleTime: Infinity,
  });
}

/** The interlock bits of both versions, proposal first (a new input exists only there; a removed one only on the base). */
export function useBitOptions(docs: DocumentsResponse | undefined): SignalOption[] {
  return useMemo(() => {
    if (!docs) return [];
    const seen = new Map<string, SignalOption>();
    for (const o of [...bitSignalOptions(docs.proposed), ...bitSignalOptions(docs.base)]) if (!seen.has(o.value)) seen.set(o.value, o);
    return [...seen.values()].sort((a, b) => a.value.localeCompare(b.value, 'en', { numeric: true }));
  }, [docs]);
}

/** Every engine signal of a document, labelled (trace rules, the comparison scope). */
export const traceOptionsOf = (document: CellDocument): SignalOption[] => engineTraceOptions(document);

/** A mutation that refreshes the evidence when it settles. */
export function useEvidenceMutation<V>(changeoverId: string, fn: (v: V) => Promise<unknown>) {
  const qc = useQueryClient();
  return useMutation({ mutationFn: fn, onSettled: () => qc.invalidateQueries({ queryKey: evidenceKey(changeoverId) }) });
}
