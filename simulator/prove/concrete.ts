/**
 * Concrete runs of a compiled sheet and concrete rule checks. A counterexample found on
 * the encoding is replayed here before it is reported, so a `violated` verdict always
 * holds on the engine's own compiled sheet (an abstraction can only add behaviour; a
 * counterexample that needs it does not replay and the verdict stays undecided).
 */
import { createProcessImage, getBit, setBit } from '@/simulator/address/process-image';
import { parseAddressCached } from '@/simulator/address/address';
import type { CompiledSheet } from '@/simulator/plc/api';
import { canonicalAddress, type InterlockRule, type RuleCondition } from './rules';

/** Values of bits after one scan (inputs as read during it), by canonical address. */
export type Frame = Record<string, boolean>;

/** Runs a list of input vectors on a compiled sheet from its fresh state; returns the frames. */
export type Replayer = (inputs: readonly Record<string, boolean>[]) => Frame[];

/**
 * A replayer for one sheet, its input bits and the bits to watch (addresses parsed once,
 * one image reused: counterexamples are replayed many times while they are simplified).
 * Each run starts from a fresh state and a zeroed image; before each scan the I area is
 * cleared and the scan's inputs set (as the cell writes its I area before each scan);
 * each frame holds the `watch` bits after the scan.
 */
export function createReplayer(compiled: CompiledSheet, inputNames: readonly string[], watch: readonly string[]): Replayer {
  const bit = (text: string) => {
    const a = parseAddressCached(text);
    if (!a || a.size !== 'X') throw new Error(`not a bit address: ${text}`);
    return a;
  };
  const ins = inputNames.map((name) => ({ name, at: bit(name) })).filter((x) => x.at.area === 'I');
  const watched = watch.map((name) => ({ name, at: bit(name) }));
  const image = createProcessImage();
  return (inputs) => {
    const state = compiled.createState();
    image.Q.fill(0);
    image.M.fill(0);
    const frames: Frame[] = [];
    for (const vector of inputs) {
      image.I.fill(0);
      for (const x of ins) if (vector[x.name]) setBit(image, 'I', x.at.byte, x.at.bit ?? 0, true);
      compiled.scan(state, image);
      const frame: Frame = {};
      for (const w of watched) frame[w.name] = getBit(image, w.at.area, w.at.byte, w.at.bit ?? 0);
      frames.push(frame);
    }
    return frames;
  };
}

/** A condition's value in one frame (an address missing from the frame reads off). */
export function holds(c: RuleCondition, frame: Frame): boolean {
  if ('signal' in c) return (frame[canonicalAddress(c.signal)] ?? false) === (c.value === 'on');
  if ('all' in c) return c.all.every((x) => holds(x, frame));
  if ('any' in c) return c.any.some((x) => holds(x, frame));
  return !holds(c.not, frame);
}

/** The first scan whose result breaks the rule, or null if none of the frames does. */
export function firstViolation(rule: InterlockRule, frames: readonly Frame[]): number | null {
  if (rule.kind === 'never' || rule.kind === 'only-if') {
    for (let t = 0; t < frames.length; t++) {
      const f = frames[t];
      const broken = rule.kind === 'never' ? holds(rule.what, f) && holds(rule.while, f) : holds(rule.what, f) && !rule.requires.every((c) => holds(c, f));
      if (broken) return t;
    }
    return null;
  }
  // within: the oldest trigger not yet answered decides.
  let oldest: number | null = null;
  let was = false;
  for (let t = 0; t < frames.length; t++) {
    const x = holds(rule.after, frames[t]);
    const y = holds(rule.expect, frames[t]);
    const trigger = rule.trigger === 'holds' ? x : x && !was;
    was = x;
    if (y) {
      oldest = null;
      continue;
    }
    if (oldest === null && trigger) oldest = t;
    if (oldest !== null && t - oldest >= rule.scans) return t;
  }
  return null;
}
