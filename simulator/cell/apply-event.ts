/**
 * Events from outside (an operator, a drill, a replayed log) applied to a running cell:
 * each is parsed and checked first, and a rejected one changes nothing.
 */
import { formatAddress, parseAddress, writeAddress } from '@/simulator/address';
import { parsePointRef, resolvePointMap, restartPointMap, stagePointMap } from '@/simulator/controller/point-map';
import { rejected, type Problem, type Result } from '@/simulator/shared/result';
import { validateStagedRows } from '@/simulator/schema/validate';
import { deviceFor, operate } from './devices';
import { download } from './download';
import type { CellEvent } from './events';
import type { CellParts } from './parts';
import type { Signals } from './signals';

/** A force target in canonical form: a PLC address as formatted, or a controller point. */
function forceTarget(target: string): Result<string, Problem> {
  if (target.startsWith('%')) {
    const a = parseAddress(target);
    if (!a.ok) return { ok: false, errors: a.errors.map((p) => ({ ...p, path: ['target'] })) };
    return { ok: true, value: formatAddress(a.value) };
  }
  if (!parsePointRef(target)) return rejected('unknown_target', `"${target}" is neither a PLC address nor a controller point`, ['target']);
  return { ok: true, value: target };
}

/** Applies a parsed event at the current time; a rejected one changes nothing. */
export function applyParsed(parts: CellParts, signals: Signals, e: CellEvent): Result<true, Problem> {
  const { wiring, controller: ctl, plc, forces, board } = parts;
  switch (e.type) {
    case 'press':
    case 'release':
    case 'toggle':
    case 'set-selector':
    case 'set-analog':
    case 'set-field': {
      const d = deviceFor(parts.devices, e.device, e.type);
      return d.ok ? operate(d.value, e) : d;
    }
    case 'force':
    case 'unforce': {
      const t = forceTarget(e.target);
      if (!t.ok) return t;
      if (e.type === 'force') {
        if (!Number.isFinite(e.value)) return rejected('invalid_value', 'a forced value must be finite', ['value']);
        forces.set(t.value, e.value);
        if (t.value.startsWith('%')) writeAddress(plc.image, t.value, e.value);
      } else {
        if (!forces.delete(t.value)) return rejected('not_forced', `${t.value} is not forced`, ['target']);
        // The address returns to 0 until the wiring (inputs) or the logic (outputs, memory) writes it again.
        if (t.value.startsWith('%')) writeAddress(plc.image, t.value, 0);
      }
      if (!t.value.startsWith('%')) ctl.writeOutputs(wiring);
      else wiring.updateLoads();
      return { ok: true, value: true };
    }
    case 'restart-controller':
      ctl.pointMap = restartPointMap(ctl.pointMap);
      ctl.sync();
      ctl.setLive(resolvePointMap(ctl.pointMap.live));
      ctl.actor.send({ type: 'RESTART' });
      ctl.writeOutputs(wiring);
      return { ok: true, value: true };
    case 'power-controller':
      ctl.sync();
      ctl.actor.send({ type: e.on ? 'POWER_ON' : 'POWER_OFF' });
      ctl.writeOutputs(wiring);
      return { ok: true, value: true };
    case 'stage-point-map': {
      const v = validateStagedRows(parts.doc, e.rows);
      if (!v.ok) return v;
      ctl.pointMap = stagePointMap(ctl.pointMap, v.value);
      return { ok: true, value: true };
    }
    case 'discard-staged':
      ctl.pointMap = { live: ctl.pointMap.live, staged: null };
      return { ok: true, value: true };
    case 'inject-fault':
      return board.add(e.fault);
    case 'clear-fault':
      return board.clear(e.id);
    case 'download':
      return download(parts, signals, e);
  }
}
