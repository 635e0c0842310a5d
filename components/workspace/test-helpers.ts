/** Shared fixtures for the workspace unit tests (not shipped to the browser: only tests import it). */
import { cellDocumentSchema, pickAndPlaceCell, type CellDocument } from '@/simulator';

/** The demo pick-and-place cell as a parsed document. */
export function demoDocument(): CellDocument {
  return cellDocumentSchema.parse(pickAndPlaceCell);
}

/** An in-memory Storage, as localStorage behaves. */
export class MemoryStorage implements Storage {
  private map = new Map<string, string>();
  get length() {
    return this.map.size;
  }
  clear() {
    this.map.clear();
  }
  getItem(key: string) {
    return this.map.has(key) ? this.map.get(key)! : null;
  }
  key(index: number) {
    return [...this.map.keys()][index] ?? null;
  }
  removeItem(key: string) {
    this.map.delete(key);
  }
  setItem(key: string, value: string) {
    this.map.set(key, String(value));
  }
}
