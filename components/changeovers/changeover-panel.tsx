'use client';
/**
 * What a person does with a changeover, by its state: pin the proposal (or go back to
 * drafting), name the countersigner, sign, countersign, and roll back — each shown only to
 * whom it is for, and each checked again by its route. Readiness for a signature is read live
 * from the evidence (the proofs and checks sections share the query), so the buttons wake up
 * as soon as the last verdict is accepted.
 */
import { useMutation, useQueryClient } from '@tanstack/react-query';
import Link from 'next/link';
import { useRouter } from 'next/navigation';
import { useState, type FormEvent, type ReactNode } from 'react';
import { AlertTriangle, BadgeCheck, CheckCircle2, FileText, Hourglass, PencilLine, Pin, PinOff, Signature, Undo2 } from 'lucide-react';
import { fetchJson } from '@/lib/api/client';
import type { Changeover, ChangeoverAbilities, CountersignerCandidate } from '@/lib/changeovers/types';
import { signBlockers } from '@/lib/changeovers/sign-rules';
import { ROLE_LABELS } from '@/lib/roles';
import { Button } from '@/components/ui/button';
import { formatDateTime } from '@/lib/format';
import { Notice } from '@/components/ui/notice';
import { Dialog } from '@/components/cells/dialog';
import { DownloadButton } from '@/components/files/download-button';
import { evidenceKey, useEvidence } from './use-evidence';

type Props = {
  changeover: Changeover;
  abilities: ChangeoverAbilities;
  me: { id: string; name: string };
  candidates: CountersignerCandidate[];
};

const inputClass =
  'block w-full rounded-md border border-slate-300 bg-white px-3 py-2 text-sm text-slate-900 shadow-sm focus:border-accent-600 focus:outline-none focus:ring-2 focus:ring-accent-600/30';

function useChangeoverAction<V>(id: string, run: (v: V) => Promise<unknown>) {
  const router = useRouter();
  const qc = useQueryClient();
  return useMutation({
    mutationFn: run,
    onSuccess: () => {
      void qc.invalidateQueries({ queryKey: evidenceKey(id) });
      void qc.invalidateQueries({ queryKey: ['changeovers'] });
      router.refresh();
    },
  });
}

function Section({ title, children, testId }: { title: string; children: ReactNode; testId?: string }) {
  return (
    <div className="space-y-2 border-t border-slate-100 pt-4 first:border-t-0 first:pt-0" data-testid={testId}>
      <h3 className="text-sm font-semibold text-slate-900">{title}</h3>
      {children}
    </div>
  );
}

export function ChangeoverPanel({ changeover: co, abilities, me, candidates }: Props) {
  const open = co.state === 'drafting' || co.state === 'checked';
  return (
    <div className="space-y-4" data-testid="changeover-panel">
      <ProposalSection co={co} canEdit={abilities.edit} />
      {open && abilities.edit ? <CountersignerSection co={co} candidates={candidates} /> : null}
      <SignOffSection co={co} abilities={abilities} me={me} />
      <RollbackSection co={co} canEdit={abilities.edit} />
    </div>
  );
}

function ProposalSection({ co, canEdit }: { co: Changeover; canEdit: boolean }) {
  const pin = useChangeoverAction(co.id, () => fetchJson(`/api/changeovers/${co.id}/pin`, { method: 'POST' }));
  const unpin = useChangeoverAction(co.id, () => fetchJson(`/api/changeovers/${co.id}/pin`, { method: 'DELETE' }));
  const error = pin.error ?? unpin.error;
  const unchanged = co.latestVersion <= co.baseVersion;
  return (
    <Section title="The proposal" testId="proposal-section">
      {co.state === 'drafting' ? (
        <>
          <p className="text-sm text-slate-700">
            The proposal follows the cell’s latest version while you edit it: now <span className="font-mono">v{co.latestVersion}</span>
            {unchanged ? ', which is still the base — nothing is changed yet.' : '.'} Base <span className="font-mono">v{co.baseVersion}</span> is what runs today.
          </p>
          {canEdit ? (
            <div className="flex flex-wrap items-center gap-2">
              {co.cellActive ? (
                <Link
                  href={`/cells/${co.cellId}`}
                  className="inline-flex items-center gap-2 rounded-md border border-slate-300 bg-white px-3 py-2 text-sm font-medium text-slate-800 hover:bg-slate-100"
                  data-testid="edit-proposal"
                >
                  <PencilLine aria-hidden className="h-4 w-4" /> Edit the proposal in the workspace
                </Link>
              ) : null}
              <Button onClick={() => pin.mutate(undefined)} disabled={pin.isPending || unchanged} data-testid="pin-proposal">
                <Pin aria-hidden className="h-4 w-4" /> Pin v{co.latestVersion} for checks
              </Button>
            </div>
          ) : null}
          {canEdit ? (
            <p className="text-xs text-slate-500">
              Pinning fixes the proposal at this version: the proofs, the scenario checks and both signatures then speak of exactly one document. Edits saved
              afterwards are not part of this changeover until you go back to drafting and pin again.
            </p>
          ) : null}
        </>
      ) : co.pinnedVersion !== null ? (
        <>
          <p className="text-sm text-slate-700">
            <Pin aria-hidden className="mr-1 inline h-4 w-4 text-slate-500" />
            Pinned at <span className="font-mono">v{co.pinnedVersion}</span>
            {co.pinnedAt ? ` on ${formatDateTime(co.pinnedAt)}` : ''}; base <span className="font-mono">v{co.baseVersion}</span>.
          </p>
          {co.state === 'checked' && co.latestVersion > co.pinnedVersion ? (
            <Notice tone="info">
              The cell has moved on to <span className="font-mono">v{co.latestVersion}</span> since the pin. This changeover still covers{' '}
              <span className="font-mono">v{co.pinnedVersion}</span>; go back to drafting and pin again to include the newer edits.
            </Notice>
          ) : null}
          {co.state === 'checked' && canEdit ? (
            <Button variant="secondary" onClick={() => unpin.mutate(undefined)} disabled={unpin.isPending} data-testid="unpin-proposal">
              <PinOff aria-hidden className="h-4 w-4" /> Back to drafting{co.signedBy ? ' (drops your signature)' : ''}
            </Button>
          ) : null}
        </>
      ) : (
        <p className="text-sm text-slate-700">The proposal was never pinned.</p>
      )}
      {error ? <Notice tone="error">{error.message}</Notice> : null}
    </Section>
  );
}

function CountersignerSection({ co, candidates }: { co: Changeover; candidates: CountersignerCandidate[] }) {
  const [value, setValue] = useState(co.countersigner?.id ?? '');
  const save = useChangeoverAction(co.id, (countersignerId: string | null) => fetchJson(`/api/changeovers/${co.id}`, { method: 'PATCH', body: { countersignerId } }));
  const changed = value !== (co.countersigner?.id ?? '');
  return (
    <Section title="Countersignature">
      <p className="text-sm text-slate-700">
        A second person reviews and countersigns: another lead, a trainer or the administrator. The person you ask sees this changeover in their list.
      </p>
      <form
        className="flex flex-wrap items-end gap-2"
        onSubmit={(e) => {
          e.preventDefault();
          save.mutate(value || null);
        }}
      >
        <div className="min-w-64 flex-1 space-y-1">
          <label htmlFor="countersigner" className="block text-sm font-medium text-slate-700">
            Ask to countersign
          </label>
          <select id="countersigner" className={inputClass} value={value} onChange={(e) => setValue(e.target.value)}>
            <option value="">— nobody yet —</option>
            {candidates.map((c) => (
              <option key={c.id} value={c.id}>
                {c.name} — {ROLE_LABELS[c.role]}
                {c.organization ? `, ${c.organization}` : ''}
              </option>
            ))}
          </select>
        </div>
        <Button type="submit" variant="secondary" disabled={!changed || save.isPending}>
          Save
        </Button>
      </form>
      {save.error ? <Notice tone="error">{save.error.message}</Notice> : null}
    </Section>
  );
}

function TypedNameForm({
  label,
  button,
  name,
  disabled,
  pending,
  onSign,
  testId,
}: {
  label: string;
  button: string;
  name: string;
  disabled: boolean;
  pending: boolean;
  onSign: (typed: string) => void;
  testId: string;
}) {
  const [typed, setTyped] = useState('');
  const submit = (e: FormEvent) => {
    e.preventDefault();
    onSign(typed);
  };
  return (
    <form className="flex flex-wrap items-end gap-2" onSubmit={submit} data-testid={testId}>
      <div className="min-w-64 flex-1 space-y-1">
        <label htmlFor={`${testId}-name`} className="block text-sm font-medium text-slate-700">
          {label}
        </label>
        <input
          id={`${testId}-name`}
          className={inputClass}
          value={typed}
          autoComplete="off"
          placeholder={name}
          onChange={(e) => setTyped(e.target.value)}
          disabled={disabled}
        />
      </div>
      <Button type="submit" disabled={disabled || pending || typed.trim() === ''}>
        <Signature aria-hidden className="h-4 w-4" /> {button}
      </Button>
    </form>
  );
}

function SignOffSection({ co, abilities, me }: { co: Changeover; abilities: ChangeoverAbilities; me: { id: string; name: string } }) {
  const open = co.state === 'drafting' || co.state === 'checked';
  const evidence = useEvidence(co.id);
  const pinned = { baseVersion: co.baseVersion, proposedVersion: co.pinnedVersion ?? co.proposedVersion };
  const sign = useChangeoverAction(co.id, (confirmName: string) => fetchJson(`/api/changeovers/${co.id}/sign`, { method: 'POST', body: { ...pinned, confirmName } }));
  const unsign = useChangeoverAction(co.id, () => fetchJson(`/api/changeovers/${co.id}/sign`, { method: 'DELETE' }));
  const countersign = useChangeoverAction(co.id, (confirmName: string) =>
    fetchJson(`/api/changeovers/${co.id}/countersign`, { method: 'POST', body: { ...pinned, confirmName } }),
  );
  const error = sign.error ?? unsign.error ?? countersign.error;

  if (!open) {
    return (
      <Section title="Sign-off" testId="signoff-section">
        {co.state === 'signed-off' || co.state === 'rolled-back' ? (
          <div className="flex flex-wrap items-center gap-3">
            <p className="text-sm text-slate-700">
              <BadgeCheck aria-hidden className="mr-1 inline h-4 w-4 text-accent-700" />
              Signed off: the record holds both signatures, the hashes of both versions and every verdict.
            </p>
            <Link href={`/changeovers/${co.id}/record`} className="inline-flex items-center gap-2 text-sm font-medium text-accent-700 hover:underline" data-testid="open-record">
              <FileText aria-hidden className="h-4 w-4" /> Open the signed record
            </Link>
            <DownloadButton
              label="Download the printed report (PDF)"
              url={`/api/changeovers/${co.id}/report`}
              fallbackName="changeover-record.pdf"
              waitingNote="The report is being printed; it downloads as soon as it is ready."
              testId="download-report"
            />
          </div>
        ) : (
          <p className="text-sm text-slate-600">Abandoned before sign-off: nothing was signed.</p>
        )}
      </Section>
    );
  }

  const data = evidence.data?.evidence;
  const blockers = data ? signBlockers(co, data) : null;
  const ready = blockers !== null && blockers.length === 0;
  const countersignerName = co.countersigner?.name ?? 'the person you ask';
  return (
    <Section title="Sign-off" testId="signoff-section">
      {blockers === null ? (
        <p className="text-sm text-slate-500">{evidence.error ? `The evidence could not be read: ${evidence.error.message}` : 'Reading the evidence…'}</p>
      ) : ready ? (
        <p className="text-sm text-accent-900" data-testid="signoff-ready">
          <CheckCircle2 aria-hidden className="mr-1 inline h-4 w-4 align-[-3px]" />
          Ready to sign: every proof on <span className="font-mono">v{pinned.proposedVersion}</span> is proved or accepted with a reason, and every changed scenario
          outcome is accepted.
        </p>
      ) : (
        <div className="rounded-md border border-amber-300 bg-amber-50 px-3 py-2 text-sm text-amber-950" data-testid="signoff-blockers">
          <p className="flex items-center gap-1 font-medium">
            <AlertTriangle aria-hidden className="h-4 w-4" /> Not ready to sign yet:
          </p>
          <ul className="mt-1 list-disc space-y-0.5 pl-5">
            {blockers.map((b) => (
              <li key={b}>{b}</li>
            ))}
          </ul>
        </div>
      )}

      {co.signedBy ? (
        <p className="text-sm text-slate-700" data-testid="signature-line">
          <Signature aria-hidden className="mr-1 inline h-4 w-4 text-slate-500" />
          Signed by <span className="font-medium">{co.signedBy.name}</span> on {formatDateTime(co.signedAt)}.{' '}
          <Hourglass aria-hidden className="mx-1 inline h-4 w-4 text-slate-500" />
          Waiting for the countersignature{co.countersigner ? ` of ${co.countersigner.name}` : ''}.
        </p>
      ) : null}

      {abilities.edit && !co.signedBy ? (
        <TypedNameForm
          testId="sign-form"
          label={`Type your name to sign (${me.name})`}
          button="Sign the changeover"
          name={me.name}
          disabled={!ready || co.state !== 'checked'}
          pending={sign.isPending}
          onSign={(n) => sign.mutate(n)}
        />
      ) : null}
      {abilities.edit && co.signedBy ? (
        <div className="flex flex-wrap items-center gap-2">
          <p className="text-sm text-slate-600">Next: {countersignerName} countersigns from their own sign-in.</p>
          <Button variant="ghost" onClick={() => unsign.mutate(undefined)} disabled={unsign.isPending}>
            Withdraw my signature
          </Button>
        </div>
      ) : null}
      {abilities.countersign && !abilities.edit && co.signedBy ? (
        <TypedNameForm
          testId="countersign-form"
          label={`Type your name to countersign (${me.name})`}
          button="Countersign"
          name={me.name}
          disabled={!ready}
          pending={countersign.isPending}
          onSign={(n) => countersign.mutate(n)}
        />
      ) : null}
      {abilities.countersign && !abilities.edit && !co.signedBy ? (
        <p className="text-sm text-slate-600">{co.openedBy.name} signs first; you countersign after.</p>
      ) : null}
      {error ? <Notice tone="error">{error.message}</Notice> : null}
    </Section>
  );
}

function RollbackSection({ co, canEdit }: { co: Changeover; canEdit: boolean }) {
  const [confirming, setConfirming] = useState(false);
  const rollback = useChangeoverAction(co.id, () => fetchJson<{ version: number }>(`/api/changeovers/${co.id}/rollback`, { method: 'POST', body: { confirm: true } }));
  const signedOff = co.state === 'signed-off';
  const open = co.state === 'drafting' || co.state === 'checked';
  const nothingToRestore = co.latestVersion === co.baseVersion;

  if (co.state === 'rolled-back' || co.state === 'withdrawn') {
    return (
      <Section title={co.state === 'rolled-back' ? 'Rolled back' : 'Abandoned'} testId="rollback-section">
        <p className="text-sm text-slate-700" data-testid="rollback-line">
          <Undo2 aria-hidden className="mr-1 inline h-4 w-4 text-slate-500" />
          {co.state === 'rolled-back' ? 'Rolled back' : 'Abandoned'} by {co.rolledBackBy?.name} on {formatDateTime(co.rolledBackAt)}
          {co.rollbackVersion !== null && co.rollbackVersion !== co.baseVersion ? (
            <>
              : version <span className="font-mono">v{co.rollbackVersion}</span> of the cell is the base document (<span className="font-mono">v{co.baseVersion}</span>) again.
            </>
          ) : (
            <>: the cell was still at the base (<span className="font-mono">v{co.baseVersion}</span>), so no version was needed.</>
          )}
        </p>
        {co.cellActive ? (
          <Link href={`/cells/${co.cellId}`} className="text-sm font-medium text-accent-700 hover:underline">
            Open the cell
          </Link>
        ) : null}
      </Section>
    );
  }

  return (
    <Section title="Rollback" testId="rollback-section">
      <p className="text-sm text-slate-700">
        {signedOff
          ? `If the change goes wrong on the floor, roll back: the base (v${co.baseVersion}) becomes the cell's current version again, as a new version that names this changeover. Any time after sign-off, by ${co.openedBy.name}.`
          : `Until sign-off you can abandon the proposal: the base (v${co.baseVersion}) becomes the cell's current version again and the changeover closes, so an unapproved edit never stays the latest version.`}
      </p>
      {canEdit && (signedOff || open) ? (
        <Button variant="danger" onClick={() => setConfirming(true)} data-testid="rollback-open">
          <Undo2 aria-hidden className="h-4 w-4" /> {signedOff ? `Roll back to v${co.baseVersion}` : 'Abandon the proposal'}
        </Button>
      ) : null}
      {rollback.error ? <Notice tone="error">{rollback.error.message}</Notice> : null}
      <Dialog title={signedOff ? 'Roll back this changeover?' : 'Abandon this proposal?'} open={confirming} onClose={() => setConfirming(false)}>
        <div className="space-y-3 text-sm text-slate-700">
          {nothingToRestore ? (
            <p>The cell is still at the base version (v{co.baseVersion}): nothing is restored, the changeover just closes.</p>
          ) : (
            <p>
              The cell gets a new version <span className="font-mono">v{co.latestVersion + 1}</span> whose document is the base <span className="font-mono">v{co.baseVersion}</span>. Versions{' '}
              <span className="font-mono">v{co.baseVersion + 1}</span>–<span className="font-mono">v{co.latestVersion}</span> stay in the history.
            </p>
          )}
          {signedOff ? <p>The signed record stays as it was; the rollback is recorded against the changeover with your name and the time.</p> : null}
          <p>Anyone with the cell open in the workspace will be told their copy is stale when they save.</p>
          <div className="flex justify-end gap-2">
            <Button variant="secondary" onClick={() => setConfirming(false)}>
              Cancel
            </Button>
            <Button
              variant="danger"
              data-testid="rollback-confirm"
              disabled={rollback.isPending}
              onClick={() => rollback.mutate(undefined, { onSettled: () => setConfirming(false) })}
            >
              {signedOff ? 'Roll back now' : 'Abandon and restore the base'}
            </Button>
          </div>
        </div>
      </Dialog>
    </Section>
  );
}
