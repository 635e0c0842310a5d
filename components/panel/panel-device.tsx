'use client';
import { useRef, type KeyboardEvent, type PointerEvent } from 'react';
import { cn } from '@/components/ui/cn';
import type { PanelDevice } from '@/simulator';
import { usePanelSend, type DeviceSnapshot } from './use-panel';
import { StateMark } from '@/components/workspace/state-mark';
import { CAP, COLOUR_MEANING, type DeviceColour } from './colours';

type Props = { device: PanelDevice; state: DeviceSnapshot | undefined; operable: boolean };

/** One panel device, drawn and operated by its type. `operable` is false in edit mode. */
export function PanelDeviceView({ device, state, operable }: Props) {
  switch (device.type) {
    case 'push-button':
    case 'illuminated-button':
      return <PushButton device={device} state={state} operable={operable} />;
    case 'e-stop':
      return <EStop device={device} state={state} operable={operable} />;
    case 'selector-switch':
      return <Selector device={device} state={state} operable={operable} />;
    case 'pilot-light':
      return <Lamp colour={device.colour} on={Boolean(state?.lamps?.[0])} label={device.label} testId={`lamp-${device.id}`} />;
    case 'stack-light':
      return <StackLight device={device} state={state} />;
    case 'potentiometer':
      return <Potentiometer device={device} state={state} operable={operable} />;
    case 'numeric-display':
      return <NumericDisplay device={device} state={state} />;
  }
}

/** Press on pointer/key down, release on up: a momentary contact follows the hand; a maintained one toggles on each press. */
function usePressHold(id: string, operable: boolean) {
  const send = usePanelSend();
  const held = useRef(false);
  const down = () => {
    if (!operable || held.current) return;
    held.current = true;
    send({ type: 'press', device: id });
  };
  const up = () => {
    if (!held.current) return;
    held.current = false;
    send({ type: 'release', device: id });
  };
  return {
    onPointerDown: (e: PointerEvent<HTMLButtonElement>) => {
      if (e.button !== 0) return;
      e.currentTarget.setPointerCapture?.(e.pointerId);
      down();
    },
    onPointerUp: up,
    onPointerCancel: up,
    onLostPointerCapture: up,
    onBlur: up,
    onKeyDown: (e: KeyboardEvent<HTMLButtonElement>) => {
      if ((e.key === ' ' || e.key === 'Enter') && !e.repeat) {
        e.preventDefault();
        down();
      }
    },
    onKeyUp: (e: KeyboardEvent<HTMLButtonElement>) => {
      if (e.key === ' ' || e.key === 'Enter') {
        e.preventDefault();
        up();
      }
    },
  };
}

function PushButton({ device, state, operable }: { device: Extract<PanelDevice, { type: 'push-button' | 'illuminated-button' }>; state: DeviceSnapshot | undefined; operable: boolean }) {
  const handlers = usePressHold(device.id, operable);
  const maintained = device.action === 'maintained';
  const pressed = maintained ? Boolean(state?.latched) : Boolean(state?.pressed);
  const lit = device.type === 'illuminated-button' && Boolean(state?.lamps?.[0]);
  const cap = CAP[device.colour];
  return (
    <div className="flex flex-col items-center gap-1">
      <button
        type="button"
        aria-pressed={pressed}
        aria-disabled={!operable}
        aria-label={`${device.label} (${device.contact}, ${device.action}, ${device.colour}: ${COLOUR_MEANING[device.colour]})${lit ? ', lit' : ''}`}
        data-testid={`panel-${device.id}`}
        {...handlers}
        className={cn(
          'relative grid h-14 w-14 touch-none select-none place-items-center rounded-full border-4 border-slate-400 shadow-[inset_0_-4px_0_rgba(0,0,0,0.35)] transition-transform',
          lit ? cap.lit : cap.off,
          lit && 'ring-4 ring-white/80',
          pressed && 'translate-y-0.5 scale-95 shadow-[inset_0_3px_6px_rgba(0,0,0,0.5)]',
          !operable && 'cursor-default',
        )}
      >
        <span className={cn('text-[10px] font-bold', cap.text)}>{device.contact}</span>
      </button>
      <StateMark on={pressed} onText={maintained ? 'IN' : 'PRESSED'} offText={maintained ? 'OUT' : 'released'} />
      {device.type === 'illuminated-button' ? <StateMark on={lit} onText="LIT" offText="dark" /> : null}
    </div>
  );
}

function EStop({ device, state, operable }: { device: Extract<PanelDevice, { type: 'e-stop' }>; state: DeviceSnapshot | undefined; operable: boolean }) {
  const send = usePanelSend();
  const latched = Boolean(state?.latched);
  return (
    <div className="flex flex-col items-center gap-1">
      {/* The background disc and the mushroom head as the document colours them: red on yellow
          per IEC 60204-1 §10.7.3 (anything else raises a panel warning). */}
      <div className={cn('grid h-20 w-20 place-items-center rounded-full ring-1 ring-slate-600', CAP[device.background ?? 'yellow'].lit)}>
        <button
          type="button"
          aria-pressed={latched}
          aria-disabled={!operable}
          aria-label={`${device.label}: e-stop, ${latched ? 'latched in' : 'released'}`}
          data-testid={`panel-${device.id}`}
          onClick={() => operable && !latched && send({ type: 'press', device: device.id })}
          className={cn(
            'h-14 w-14 rounded-full border-4 border-slate-900/60 shadow-[inset_0_-5px_0_rgba(0,0,0,0.35)]',
            latched ? cn('scale-90 shadow-[inset_0_4px_8px_rgba(0,0,0,0.6)]', CAP[device.colour].off) : CAP[device.colour].lit,
          )}
        />
      </div>
      <StateMark on={latched} onText="LATCHED" offText="armed" />
      <button
        type="button"
        disabled={!operable || !latched}
        onClick={() => send({ type: 'release', device: device.id })}
        className="rounded border border-slate-400 bg-white px-1.5 py-0.5 text-[10px] font-medium text-slate-700 hover:bg-slate-100 disabled:opacity-40"
        data-testid={`panel-${device.id}-release`}
      >
        Twist to release
      </button>
    </div>
  );
}

function Selector({ device, state, operable }: { device: Extract<PanelDevice, { type: 'selector-switch' }>; state: DeviceSnapshot | undefined; operable: boolean }) {
  const send = usePanelSend();
  const position = state?.position ?? 0;
  const angle = device.positions.length > 1 ? -45 + (90 * position) / (device.positions.length - 1) : 0;
  const choose = (p: number) => operable && send({ type: 'set-selector', device: device.id, position: p });
  return (
    <div className="flex flex-col items-center gap-1">
      <div aria-hidden className="relative grid h-12 w-12 place-items-center rounded-full bg-slate-900 ring-2 ring-slate-500">
        <div className="h-10 w-2.5 rounded bg-slate-200 transition-transform" style={{ transform: `rotate(${angle}deg)` }} />
      </div>
      <div role="radiogroup" aria-label={device.label} className="flex gap-0.5" data-testid={`panel-${device.id}`}>
        {device.positions.map((name, i) => (
          <button
            key={i}
            type="button"
            role="radio"
            aria-checked={position === i}
            aria-disabled={!operable}
            tabIndex={position === i ? 0 : -1}
            onClick={() => choose(i)}
            onKeyDown={(e) => {
              if (e.key === 'ArrowRight' || e.key === 'ArrowDown') choose(Math.min(device.positions.length - 1, position + 1));
              if (e.key === 'ArrowLeft' || e.key === 'ArrowUp') choose(Math.max(0, position - 1));
            }}
            className={cn(
              'rounded px-1 py-0.5 text-[10px] ring-1 ring-slate-400',
              position === i ? 'bg-slate-800 font-bold text-white ring-2 ring-slate-800' : 'bg-white text-slate-600',
            )}
          >
            {name}
          </button>
        ))}
      </div>
    </div>
  );
}

/** A lamp: ON is brighter, ringed and labelled, never colour alone. */
export function Lamp({ colour, on, label, testId, size = 'md' }: { colour: DeviceColour; on: boolean; label: string; testId?: string; size?: 'sm' | 'md' }) {
  const cap = CAP[colour];
  return (
    <div className="flex flex-col items-center gap-1" data-testid={testId} data-on={on}>
      <div
        role="img"
        aria-label={`${label}: ${colour} lamp ${on ? 'on' : 'off'}`}
        className={cn(
          'rounded-full border-slate-500',
          size === 'md' ? 'h-10 w-10' : 'h-7 w-7',
          on ? `${cap.lit} border-4 ring-4 ring-white shadow-[0_0_14px_4px_rgba(255,255,255,0.55)]` : `${cap.off} border opacity-60`,
        )}
      />
      <StateMark on={on} onText="ON" offText="off" />
    </div>
  );
}

function StackLight({ device, state }: { device: Extract<PanelDevice, { type: 'stack-light' }>; state: DeviceSnapshot | undefined }) {
  // Tier 0 is drawn at the top, as the document lists tiers top-down.
  return (
    <div className="flex flex-col items-center" data-testid={`panel-${device.id}`}>
      <div className="flex flex-col gap-0.5 rounded-t-md bg-slate-700 p-1">
        {device.tiers.map((colour, i) => {
          const on = Boolean(state?.lamps?.[i]);
          return (
            <div key={i} className="flex items-center gap-1.5" data-testid={`stack-${device.id}-${i}`} data-on={on}>
              <div
                role="img"
                aria-label={`${colour} tier ${on ? 'on' : 'off'}`}
                className={cn('h-6 w-10 rounded-sm', on ? `${CAP[colour].lit} ring-2 ring-white shadow-[0_0_12px_3px_rgba(255,255,255,0.5)]` : `${CAP[colour].off} opacity-50`)}
              />
              <span className={cn('w-7 text-[10px]', on ? 'font-bold text-white' : 'text-slate-200')}>{on ? 'ON' : 'off'}</span>
            </div>
          );
        })}
      </div>
      <div className="h-6 w-3 bg-slate-500" aria-hidden />
    </div>
  );
}

function Potentiometer({ device, state, operable }: { device: Extract<PanelDevice, { type: 'potentiometer' }>; state: DeviceSnapshot | undefined; operable: boolean }) {
  const send = usePanelSend();
  const value = state?.value ?? device.min;
  return (
    <div className="flex w-28 flex-col items-center gap-1">
      <input
        type="range"
        min={device.min}
        max={device.max}
        step={(device.max - device.min) / 100 || 1}
        value={value}
        disabled={!operable}
        aria-label={`${device.label} (${device.signal})`}
        onChange={(e) => send({ type: 'set-analog', device: device.id, value: Number(e.target.value) })}
        className="w-full accent-accent-700"
        data-testid={`panel-${device.id}`}
      />
      <span className="font-mono text-xs text-slate-800">
        {value.toFixed(1)} {device.unit}
      </span>
    </div>
  );
}

function NumericDisplay({ device, state }: { device: Extract<PanelDevice, { type: 'numeric-display' }>; state: DeviceSnapshot | undefined }) {
  const value = state?.value ?? 0;
  return (
    <output aria-label={device.label} data-testid={`panel-${device.id}`} className="rounded bg-slate-950 px-2 py-1 font-mono text-xl tracking-widest text-amber-300 ring-2 ring-slate-600">
      {String(Math.round(value)).padStart(device.digits, ' ').slice(-device.digits)}
    </output>
  );
}
