import { describe, expect, it } from 'vitest';
import { endpointText, parseEndpoint } from './endpoint-text';

describe('endpoint text', () => {
  it('round-trips the three endpoint forms', () => {
    // Forms defined by this module (device terminal, IEC 61131-3 direct address, rack/slot/channel).
    for (const e of [{ device: 'start', terminal: 'contact' }, { plc: '%IX0.0' }, { controller: { rack: 0, slot: 1, channel: 4 } }] as const) {
      expect(parseEndpoint(endpointText(e))).toEqual(e);
    }
  });
  it('upper-cases PLC addresses and rejects other text', () => {
    expect(parseEndpoint('%ix1.2')).toEqual({ plc: '%IX1.2' });
    expect(parseEndpoint('R0.S1')).toBeNull();
    expect(parseEndpoint('no terminal')).toBeNull();
  });
});
