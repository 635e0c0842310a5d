'use client';
import { useRef, useState, type KeyboardEvent, type PointerEvent } from 'react';
import { Plus, Trash2 } from 'lucide-react';
import { cn } from '@/components/ui/cn';
import type { PanelDevice } from '@/simulator';
import { PanelDeviceView } from './panel-device';
import { usePanel, usePanelEditing, type DeviceSnapshot } from './use-panel';
import { BUTTON_FUNCTIONS, COLOURS, COLOUR_MEANING, type DeviceColour } from './colours';
import { PANEL_KINDS, newPanelDevice } from './new-device';

/** One plate millimetre in screen pixels. */
const SCALE = 1;
/** Footprint reserved for a device on the plate (mm), for sizing the plate and the drag bounds. */
const CELL_W = 110;
const CELL_H = 150;
/** Arrow keys move a device by this much in edit mode (mm). */
const NUDGE = 10;

/** The operator panel: a front plate with the cell's panel devices; operate them, or edit the layout in edit mode. */
export function PanelArea() {
  const { panel, editMode, states: byId, selection, select, edit, related, warnings } = usePanel();
  const selectedDevice = selection?.kind === 'device' ? panel.find((d) => d.id === selection.id) : undefined;

  const width = Math.max(640, ...panel.map((d) => d.position.x + CELL_W)) * SCALE;
  const height = Math.max(260, ...panel.map((d) => d.position.y + CELL_H)) * SCALE;

  const move = (id: string, x: number, y: number) =>
    edit(
      (doc) => {
        const d = doc.panel.find((p) => p.id === id);
        if (d) d.position = { x: Math.max(0, Math.round(x)), y: Math.max(0, Math.round(y)) };
      },
      `Move ${id}`,
    );

  return (
    <div className="flex flex-col gap-3 lg:flex-row">
      <section aria-label="Front plate" className="min-w-0 flex-1 overflow-auto rounded-lg border border-slate-300 bg-slate-100 p-3">
        <div
          className="relative rounded-md border-2 border-slate-400 bg-gradient-to-b from-slate-200 to-slate-300 shadow-inner"
          style={{ width, height }}
          data-testid="front-plate"
        >
          {panel.map((device) => (
            <PlateSlot
              key={device.id}
              device={device}
              state={byId.get(device.id)}
              editMode={editMode}
              selected={selection?.kind === 'device' && selection.id === device.id}
              related={related.devices.has(device.id)}
              onSelect={() => select({ kind: 'device', id: device.id })}
              onMove={move}
            />
          ))}
          {panel.length === 0 ? <p className="p-6 text-sm text-slate-600">No panel devices yet. Switch to edit mode to add some.</p> : null}
        </div>
        {warnings.length > 0 ? (
          <ul aria-label="Panel colour warnings" data-testid="panel-warnings" className="mt-3 space-y-1 rounded border border-amber-300 bg-amber-50 p-2 text-xs text-amber-900">
            {warnings.map((w) => (
              <li key={`${w.path.join('.')}|${w.code}`}>{w.message}</li>
            ))}
          </ul>
        ) : null}
      </section>
      {editMode ? (
        <aside className="w-full space-y-4 lg:w-72" aria-label="Panel editor">
          <AddDevice panel={panel} />
          {selectedDevice ? <DeviceForm key={selectedDevice.id} device={selectedDevice} /> : <p className="text-sm text-slate-600">Select a device on the plate to edit it. Drag or use the arrow keys to move it.</p>}
        </aside>
      ) : null}
    </div>
  );
}

function PlateSlot({
  device,
  state,
  editMode,
  selected,
  related,
  onSelect,
  onMove,
}: {
  device: PanelDevice;
  state: DeviceSnapshot | undefined;
  editMode: boolean;
  selected: boolean;
  /** Linked to the selection elsewhere (its wire or address is selected). */
  related: boolean;
  onSelect: () => void;
  onMove: (id: string, x: number, y: number) => void;
}) {
  const drag = useRef<{ startX: number; startY: number; x: number; y: number } | null>(null);
  const [offset, setOffset] = useState<{ dx: number; dy: number } | null>(null);

  const editHandlers = editMode
    ? {
        onPointerDown: (e: PointerEvent<HTMLDivElement>) => {
          onSelect();
          e.currentTarget.setPointerCapture(e.pointerId);
          drag.current = { startX: e.clientX, startY: e.clientY, x: device.position.x, y: device.position.y };
        },
        onPointerMove: (e: PointerEvent<HTMLDivElement>) => {
          if (!drag.current) return;
          setOffset({ dx: e.clientX - drag.current.startX, dy: e.clientY - drag.current.startY });
        },
        onPointerUp: (e: PointerEvent<HTMLDivElement>) => {
          const d = drag.current;
          drag.current = null;
          setOffset(null);
          if (!d) return;
          const dx = (e.clientX - d.startX) / SCALE;
          const dy = (e.clientY - d.startY) / SCALE;
          if (Math.abs(dx) + Math.abs(dy) > 2) onMove(device.id, d.x + dx, d.y + dy);
        },
        onKeyDown: (e: KeyboardEvent<HTMLDivElement>) => {
          const step = { ArrowLeft: [-NUDGE, 0], ArrowRight: [NUDGE, 0], ArrowUp: [0, -NUDGE], ArrowDown: [0, NUDGE] }[e.key];
          if (!step) return;
          e.preventDefault();
          onMove(device.id, device.position.x + step[0], device.position.y + step[1]);
        },
      }
    : {};

  return (
    <div
      className={cn(
        'absolute flex w-[112px] flex-col items-center gap-1.5 rounded-md p-1.5',
        editMode && 'cursor-move border border-dashed border-slate-500 bg-white/40 focus:outline-none focus-visible:ring-2 focus-visible:ring-accent-600',
        selected ? 'ring-2 ring-accent-600' : related && 'ring-2 ring-accent-300',
      )}
      style={{
        left: device.position.x * SCALE + (offset?.dx ?? 0),
        top: device.position.y * SCALE + (offset?.dy ?? 0),
      }}
      tabIndex={editMode ? 0 : undefined}
      aria-label={editMode ? `${device.label}, ${device.type}; arrow keys move it` : undefined}
      data-testid={`plate-slot-${device.id}`}
      onClick={editMode ? undefined : onSelect}
      {...editHandlers}
    >
      {/* In edit mode the device is a picture; the pointer belongs to the slot. */}
      <div className={cn(editMode && 'pointer-events-none')}>
        <PanelDeviceView device={device} state={state} operable={!editMode} />
      </div>
      {/* Legend plate under the device, as on a real front plate. */}
      <span className="line-clamp-2 max-w-full rounded-sm bg-slate-800 px-1.5 py-0.5 text-center text-[11px] leading-tight font-medium text-slate-50">{device.label}</span>
    </div>
  );
}

function AddDevice({ panel }: { panel: PanelDevice[] }) {
  const { edit, select } = usePanelEditing();
  const [kind, setKind] = useState(PANEL_KINDS[0].kind);
  const add = () => {
    const maxY = Math.max(0, ...panel.map((d) => d.position.y));
    const row = panel.filter((d) => d.position.y === maxY).length;
    const device = newPanelDevice(kind, panel.map((d) => d.id), { x: 20 + (row % 6) * 120, y: panel.length === 0 ? 20 : maxY + (row >= 6 ? 160 : 0) });
    edit((doc) => {
      doc.panel.push(device);
    }, `Add ${device.id}`);
    select({ kind: 'device', id: device.id });
  };
  return (
    <div className="rounded-md border border-slate-300 bg-white p-3">
      <label className="block text-xs font-semibold text-slate-700" htmlFor="add-panel-kind">
        Add a panel device
      </label>
      <div className="mt-1 flex gap-2">
        <select id="add-panel-kind" value={kind} onChange={(e) => setKind(e.target.value)} className="min-w-0 flex-1 rounded border border-slate-300 px-2 py-1 text-sm">
          {PANEL_KINDS.map((k) => (
            <option key={k.kind} value={k.kind}>
              {k.label}
            </option>
          ))}
        </select>
        <button type="button" onClick={add} className="inline-flex items-center gap-1 rounded bg-accent-700 px-2 py-1 text-sm text-white hover:bg-accent-800">
          <Plus aria-hidden className="h-4 w-4" /> Add
        </button>
      </div>
    </div>
  );
}

function DeviceForm({ device }: { device: PanelDevice }) {
  const { edit, select } = usePanelEditing();
  const [label, setLabel] = useState(device.label);
  const update = (label: string, recipe: (d: PanelDevice) => void) =>
    edit((doc) => {
      const d = doc.panel.find((p) => p.id === device.id);
      if (d) recipe(d);
    }, `${label} ${device.id}`);

  return (
    <form className="space-y-3 rounded-md border border-slate-300 bg-white p-3 text-sm" aria-label={`Edit ${device.label}`} onSubmit={(e) => e.preventDefault()}>
      <p className="font-mono text-xs text-slate-500">
        {device.id} · {device.type}
      </p>
      <label className="block">
        <span className="text-xs font-semibold text-slate-700">Label</span>
        <input
          value={label}
          maxLength={200}
          onChange={(e) => setLabel(e.target.value)}
          onBlur={() => label !== device.label && update('Rename', (d) => void (d.label = label))}
          className="mt-1 w-full rounded border border-slate-300 px-2 py-1"
        />
      </label>
      <label className="block">
        <span className="text-xs font-semibold text-slate-700">Colour</span>
        <select value={device.colour} onChange={(e) => update('Recolour', (d) => void (d.colour = e.target.value as DeviceColour))} className="mt-1 w-full rounded border border-slate-300 px-2 py-1">
          {COLOURS.map((c) => (
            <option key={c} value={c}>
              {c} — {COLOUR_MEANING[c]}
            </option>
          ))}
        </select>
      </label>
      {device.type === 'e-stop' ? (
        <label className="block">
          <span className="text-xs font-semibold text-slate-700">Background</span>
          <select
            value={device.background ?? 'yellow'}
            onChange={(e) => update('Set background of', (d) => void ((d as typeof device).background = e.target.value as DeviceColour))}
            className="mt-1 w-full rounded border border-slate-300 px-2 py-1"
          >
            {COLOURS.map((c) => (
              <option key={c} value={c}>
                {c}
              </option>
            ))}
          </select>
        </label>
      ) : null}
      {device.type === 'push-button' || device.type === 'illuminated-button' ? (
        <>
          <label className="block">
            <span className="text-xs font-semibold text-slate-700">Function</span>
            <select
              value={device.function ?? ''}
              onChange={(e) =>
                update('Set function of', (d) => {
                  const b = d as typeof device;
                  if (e.target.value === '') delete b.function;
                  else b.function = e.target.value as NonNullable<typeof device.function>;
                })
              }
              className="mt-1 w-full rounded border border-slate-300 px-2 py-1"
            >
              <option value="">not said</option>
              {BUTTON_FUNCTIONS.map((f) => (
                <option key={f} value={f}>
                  {f}
                </option>
              ))}
            </select>
          </label>
          <label className="block">
            <span className="text-xs font-semibold text-slate-700">Kind</span>
            <select
              value={device.type}
              onChange={(e) => update('Change kind of', (d) => void ((d as { type: string }).type = e.target.value))}
              className="mt-1 w-full rounded border border-slate-300 px-2 py-1"
            >
              <option value="push-button">push button</option>
              <option value="illuminated-button">illuminated button</option>
            </select>
          </label>
          <fieldset className="flex gap-4">
            <legend className="text-xs font-semibold text-slate-700">Contact</legend>
            {(['NO', 'NC'] as const).map((c) => (
              <label key={c} className="flex items-center gap-1">
                <input type="radio" name="contact" checked={device.contact === c} onChange={() => update('Set contact of', (d) => void ((d as typeof device).contact = c))} /> {c}
              </label>
            ))}
          </fieldset>
          <fieldset className="flex gap-4">
            <legend className="text-xs font-semibold text-slate-700">Action</legend>
            {(['momentary', 'maintained'] as const).map((a) => (
              <label key={a} className="flex items-center gap-1">
                <input type="radio" name="action" checked={device.action === a} onChange={() => update('Set action of', (d) => void ((d as typeof device).action = a))} /> {a}
              </label>
            ))}
          </fieldset>
        </>
      ) : null}
      {device.type === 'selector-switch' ? (
        <label className="block">
          <span className="text-xs font-semibold text-slate-700">Positions (comma separated, 2–4)</span>
          <input
            defaultValue={device.positions.join(', ')}
            onBlur={(e) => {
              const positions = e.target.value.split(',').map((s) => s.trim()).filter(Boolean).slice(0, 4);
              if (positions.length >= 2) update('Set positions of', (d) => void ((d as typeof device).positions = positions));
            }}
            className="mt-1 w-full rounded border border-slate-300 px-2 py-1"
          />
        </label>
      ) : null}
      {device.type === 'stack-light' ? (
        <label className="block">
          <span className="text-xs font-semibold text-slate-700">Tiers, top first (comma separated colours, 1–5)</span>
          <input
            defaultValue={device.tiers.join(', ')}
            onBlur={(e) => {
              const tiers = e.target.value.split(',').map((s) => s.trim()).filter((s): s is DeviceColour => COLOURS.includes(s as DeviceColour)).slice(0, 5);
              if (tiers.length >= 1) update('Set tiers of', (d) => void ((d as typeof device).tiers = tiers));
            }}
            className="mt-1 w-full rounded border border-slate-300 px-2 py-1"
          />
        </label>
      ) : null}
      <button
        type="button"
        onClick={() => {
          edit((doc) => {
            doc.panel = doc.panel.filter((p) => p.id !== device.id);
          }, `Remove ${device.id}`);
          select(null);
        }}
        className="inline-flex items-center gap-1 rounded border border-red-300 px-2 py-1 text-red-700 hover:bg-red-50"
      >
        <Trash2 aria-hidden className="h-4 w-4" /> Remove device
      </button>
      <p className="text-xs text-slate-500">Wiring rows that name a removed device show a problem in the Field area until fixed.</p>
    </form>
  );
}
