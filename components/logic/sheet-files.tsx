'use client';
/**
 * The Logic area's sheet files: export the sheet as IEC 61131-3 Structured Text or as an
 * IEC 61131-10 XML document, and import such a document back in place of the sheet.
 *
 * `useSheetFiles` holds the flow; `SheetFilesControls` sit in the area's toolbar and
 * `SheetFilesPanel` below it (the problem list, the confirmation, what happened). The engine's
 * exchange code runs in a worker started on each click (./sheet-exchange.worker.ts), so it
 * adds nothing to the workspace's bundles and a big file does not freeze the page.
 * An import is read and checked in full before anything changes: a file with problems lists
 * them (focus moves to the list) and leaves the sheet as it is; a good one asks first, naming
 * both sheets' blocks and wires, then replaces the sheet through `onReplace` (one undo step).
 */
import { useCallback, useEffect, useId, useLayoutEffect, useRef, useState, type ChangeEvent, type KeyboardEvent, type RefObject } from 'react';
import { AlertTriangle, FileCode2, FileDown, FileUp, X } from 'lucide-react';
import { cn } from '@/components/ui/cn';
import { countsText, importFileRefusal, replaceQuestion, sheetCounts, type ExchangeProblemRow, type ExportKind } from './exchange-flow';
import type { Sheet } from './sheet-graph';
import type { ExchangeReply, ExchangeRequest, ExportOutcome, ImportOutcome } from './sheet-exchange';

type Panel =
  | { kind: 'idle' }
  | { kind: 'busy'; message: string }
  | { kind: 'done'; message: string }
  | { kind: 'problems'; title: string; intro: string; rows: ExchangeProblemRow[] }
  | { kind: 'confirm'; fileName: string; sheet: Sheet };

export type SheetFilesOptions = {
  sheet: Sheet;
  cellName: string;
  /** Whether this workspace may change the sheet (exports are always offered). */
  canImport: boolean;
  /** Replaces the sheet as one undo step named `label`. */
  onReplace(sheet: Sheet, label: string): void;
};

export type SheetFiles = ReturnType<typeof useSheetFiles>;

const EXPORT_NAMES: Record<ExportKind, string> = { st: 'Structured Text', xml: 'IEC 61131-10 XML' };

/** Offers `text` as a download named `fileName`. */
function saveText(text: string, fileName: string, mediaType: string) {
  const url = URL.createObjectURL(new Blob([text], { type: mediaType }));
  const a = document.createElement('a');
  a.href = url;
  a.download = fileName;
  document.body.appendChild(a);
  a.click();
  a.remove();
  // Late enough for the browser to have started the download.
  window.setTimeout(() => URL.revokeObjectURL(url), 10_000);
}

const workerFailed = (message: string): ExchangeProblemRow[] => [
  { where: 'this page', message: `The file work stopped (${message}). Reload the page and try again.`, code: 'worker_failed' },
];

/**
 * Runs one request in a fresh exchange worker and stops it after the answer. Type-only imports
 * from ./sheet-exchange keep the engine's exchange code in the worker's bundle alone.
 */
function inWorker<R extends ExchangeRequest>(request: R): Promise<R extends { op: 'export' } ? ExportOutcome : ImportOutcome> {
  return new Promise((resolve, reject) => {
    const worker = new Worker(new URL('./sheet-exchange.worker.ts', import.meta.url), { type: 'module' });
    worker.addEventListener('message', (e: MessageEvent<ExchangeReply>) => {
      worker.terminate();
      resolve(e.data.outcome as R extends { op: 'export' } ? ExportOutcome : ImportOutcome);
    });
    worker.addEventListener('error', (e) => {
      worker.terminate();
      reject(new Error(e.message || 'the worker failed'));
    });
    worker.postMessage(request);
  });
}

export function useSheetFiles({ sheet, cellName, canImport, onReplace }: SheetFilesOptions) {
  const [panel, setPanel] = useState<Panel>({ kind: 'idle' });
  const sheetRef = useRef(sheet);
  useLayoutEffect(() => {
    sheetRef.current = sheet;
  });
  // The import's file input, focused again once a confirmation or problem list closes.
  const inputId = useId();
  const focusInput = useCallback(() => document.getElementById(inputId)?.focus(), [inputId]);

  const exportAs = useCallback(
    async (kind: ExportKind) => {
      setPanel({ kind: 'busy', message: `Preparing the ${EXPORT_NAMES[kind]} file…` });
      let out: ExportOutcome;
      try {
        out = await inWorker({ op: 'export', sheet: sheetRef.current, cellName, kind, now: new Date().toISOString() });
      } catch (e) {
        setPanel({ kind: 'problems', title: 'Not exported', intro: 'Nothing was downloaded.', rows: workerFailed(e instanceof Error ? e.message : String(e)) });
        return;
      }
      if (!out.ok) {
        const n = out.problems.length;
        setPanel({
          kind: 'problems',
          title: `Not exported: the sheet has ${n} problem${n === 1 ? '' : 's'}`,
          intro: `Fix ${n === 1 ? 'it' : 'them'} on the sheet, then export again. Nothing was downloaded.`,
          rows: out.problems,
        });
        return;
      }
      saveText(out.text, out.fileName, out.mediaType);
      setPanel({ kind: 'done', message: `Downloaded ${out.fileName} (${EXPORT_NAMES[kind]}).` });
    },
    [cellName],
  );

  const chooseFile = useCallback(
    async (e: ChangeEvent<HTMLInputElement>) => {
      const file = e.target.files?.[0];
      // Cleared so that choosing the same file again reads it again.
      e.target.value = '';
      if (!file || !canImport) return;
      const refusal = importFileRefusal(file);
      if (refusal) {
        setPanel({ kind: 'problems', title: 'Not imported', intro: 'The current sheet is unchanged.', rows: [{ where: file.name, message: refusal, code: 'file_size' }] });
        return;
      }
      setPanel({ kind: 'busy', message: `Reading ${file.name}…` });
      let read: ImportOutcome;
      try {
        read = await inWorker({ op: 'import', xml: await file.text() });
      } catch (err) {
        setPanel({ kind: 'problems', title: 'Not imported', intro: 'The current sheet is unchanged.', rows: workerFailed(err instanceof Error ? err.message : String(err)) });
        return;
      }
      if (!read.ok) {
        const n = read.problems.length;
        setPanel({
          kind: 'problems',
          title: `Not imported: “${file.name}” has ${n} problem${n === 1 ? '' : 's'}`,
          intro: 'The current sheet is unchanged. Each problem names the element of the file (by its localId) or the line it concerns.',
          rows: read.problems,
        });
        return;
      }
      setPanel({ kind: 'confirm', fileName: file.name, sheet: read.sheet });
    },
    [canImport],
  );

  const confirm = useCallback(() => {
    if (panel.kind !== 'confirm' || !canImport) return;
    onReplace(panel.sheet, `Import sheet from ${panel.fileName}`);
    setPanel({ kind: 'done', message: `Imported ${countsText(sheetCounts(panel.sheet))} from “${panel.fileName}”. Undo brings the previous sheet back.` });
    focusInput();
  }, [panel, canImport, onReplace, focusInput]);

  const dismiss = useCallback(() => {
    setPanel({ kind: 'idle' });
    focusInput();
  }, [focusInput]);

  return { panel, canImport, sheet, inputId, exportAs, chooseFile, confirm, dismiss };
}

const CONTROL = 'inline-flex items-center gap-1 rounded border border-slate-300 bg-white px-2 py-0.5 text-xs font-medium text-slate-800 hover:border-accent-500 hover:bg-accent-50 disabled:opacity-50';

/** The toolbar group: two exports and, where the sheet may change, the import. */
export function SheetFilesControls({ files }: { files: SheetFiles }) {
  const busy = files.panel.kind === 'busy';
  return (
    <div role="group" aria-label="Sheet files" className="inline-flex flex-wrap items-center gap-1" data-testid="sheet-files">
      <button type="button" className={CONTROL} disabled={busy} onClick={() => void files.exportAs('st')}>
        <FileDown aria-hidden className="h-3.5 w-3.5" />
        Export as Structured Text (.st)
      </button>
      <button type="button" className={CONTROL} disabled={busy} onClick={() => void files.exportAs('xml')}>
        <FileCode2 aria-hidden className="h-3.5 w-3.5" />
        Export as IEC 61131-10 XML (.xml)
      </button>
      {files.canImport ? (
        <label className={cn(CONTROL, 'cursor-pointer focus-within:ring-2 focus-within:ring-accent-500', busy && 'pointer-events-none opacity-50')}>
          <FileUp aria-hidden className="h-3.5 w-3.5" />
          Import XML…
          <input
            id={files.inputId}
            type="file"
            accept=".xml,application/xml,text/xml"
            className="sr-only"
            disabled={busy}
            onChange={(e) => void files.chooseFile(e)}
          />
        </label>
      ) : null}
    </div>
  );
}

/** What the sheet files have to say: progress, the problem list, the confirmation. */
export function SheetFilesPanel({ files }: { files: SheetFiles }) {
  const { panel } = files;
  const id = useId();
  const problemsRef = useRef<HTMLElement>(null);
  const keepRef = useRef<HTMLButtonElement>(null);
  useEffect(() => {
    if (panel.kind === 'problems') problemsRef.current?.focus();
    if (panel.kind === 'confirm') keepRef.current?.focus();
  }, [panel]);

  const onConfirmKey = (e: KeyboardEvent) => {
    if (e.key === 'Escape') {
      e.stopPropagation();
      files.dismiss();
    }
  };

  return (
    <>
      <p role="status" className={cn('px-3 text-xs text-slate-600', panel.kind === 'busy' || panel.kind === 'done' ? 'border-b border-slate-200 py-1' : 'sr-only')} data-testid="sheet-files-status">
        {panel.kind === 'busy' || panel.kind === 'done' ? panel.message : ''}
      </p>
      {panel.kind === 'problems' ? (
        <section
          ref={problemsRef}
          tabIndex={-1}
          aria-labelledby={`${id}-title`}
          className="border-b border-red-200 bg-red-50 px-3 py-2 text-sm text-red-900 outline-none focus-visible:ring-2 focus-visible:ring-inset focus-visible:ring-red-600"
          data-testid="sheet-files-problems"
        >
          <div className="flex items-start gap-2">
            <AlertTriangle aria-hidden className="mt-0.5 h-4 w-4 shrink-0 text-red-700" />
            <div className="min-w-0 flex-1">
              <h3 id={`${id}-title`} className="font-semibold">
                {panel.title}
              </h3>
              <p className="text-xs">{panel.intro}</p>
            </div>
            <button type="button" aria-label="Close the problem list" onClick={files.dismiss} className="rounded p-0.5 text-red-800 hover:bg-red-100">
              <X aria-hidden className="h-4 w-4" />
            </button>
          </div>
          <ul className="mt-1 max-h-48 space-y-0.5 overflow-y-auto pl-6 text-xs">
            {panel.rows.map((r, i) => (
              <li key={i}>
                <span className="font-mono font-medium">{r.where}</span>: {r.message}
              </li>
            ))}
          </ul>
        </section>
      ) : null}
      {panel.kind === 'confirm' ? (
        <ConfirmReplace files={files} id={id} keepRef={keepRef} onKeyDown={onConfirmKey} panel={panel} />
      ) : null}
    </>
  );
}

function ConfirmReplace({
  files,
  panel,
  id,
  keepRef,
  onKeyDown,
}: {
  files: SheetFiles;
  panel: Extract<Panel, { kind: 'confirm' }>;
  id: string;
  keepRef: RefObject<HTMLButtonElement | null>;
  onKeyDown(e: KeyboardEvent): void;
}) {
  const question = replaceQuestion(sheetCounts(files.sheet), sheetCounts(panel.sheet), panel.fileName);
  return (
    <div
      role="alertdialog"
      aria-labelledby={`${id}-confirm-title`}
      aria-describedby={`${id}-confirm-body`}
      onKeyDown={onKeyDown}
      className="border-b border-amber-300 bg-amber-50 px-3 py-2 text-sm text-amber-950"
      data-testid="sheet-files-confirm"
    >
      <h3 id={`${id}-confirm-title`} className="font-semibold">
        {question.title}
      </h3>
      <div id={`${id}-confirm-body`} className="text-xs">
        {question.lines.map((line) => (
          <p key={line}>{line}</p>
        ))}
      </div>
      <div className="mt-2 flex flex-wrap gap-2">
        <button type="button" onClick={files.confirm} className="rounded bg-accent-700 px-2.5 py-1 text-xs font-medium text-white hover:bg-accent-800">
          Replace the sheet
        </button>
        <button ref={keepRef} type="button" onClick={files.dismiss} className="rounded border border-slate-300 bg-white px-2.5 py-1 text-xs font-medium text-slate-800 hover:bg-slate-100">
          Keep the current sheet
        </button>
      </div>
    </div>
  );
}
