/**
 * Brings a cell document written under an older schema version up to the current one, so
 * documents stored or exported before a rename keep loading. Pure: the input is never
 * changed; anything that is not an older document is returned as it is (the schema then
 * says what is wrong with it).
 *
 * Version 1 → 2: the handshake input role `job` became `recipe` (same point, same meaning).
 * Only the role's key changes: device, wire and block ids are the author's own and stay, so
 * the signal names of an upgraded cell, and with them its traces and their hashes, are those
 * of the document before the upgrade.
 */
import { CELL_SCHEMA_VERSION } from './cell-document';

type Json = Record<string, unknown>;

const isObject = (x: unknown): x is Json => typeof x === 'object' && x !== null && !Array.isArray(x);

/** One step per version: takes a document of version n, returns it at version n + 1. */
const STEPS: Readonly<Record<number, (doc: Json) => Json>> = {
  1: (doc) => {
    const controller = doc.controller;
    if (!isObject(controller) || !isObject(controller.handshake) || !isObject(controller.handshake.inputs)) return { ...doc, schemaVersion: 2 };
    const handshake = controller.handshake;
    const { job, ...rest } = handshake.inputs as Json;
    // A v1 document with a `recipe` key already has an unknown key there; keep it and let the schema judge.
    const inputs = job === undefined || 'recipe' in rest ? handshake.inputs : { ...rest, recipe: job };
    return { ...doc, schemaVersion: 2, controller: { ...controller, handshake: { ...handshake, inputs } } };
  },
};

/**
 * The document at the current schema version when it was written under an older one
 * (see the file comment for what each step changes); any other input unchanged.
 */
export function upgradeCellDocument(input: unknown): unknown {
  if (!isObject(input)) return input;
  let doc: Json = input;
  while (typeof doc.schemaVersion === 'number' && doc.schemaVersion < CELL_SCHEMA_VERSION && STEPS[doc.schemaVersion]) {
    doc = STEPS[doc.schemaVersion](doc);
  }
  return doc;
}
