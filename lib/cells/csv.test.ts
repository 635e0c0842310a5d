import { describe, expect, it } from 'vitest';
import { cellDocumentSchema, pickAndPlaceCell } from '@/simulator';
import type { PointMapRow } from '@/simulator';
import { csvTemplate, endpointText, ioListToCsv, parseIoListCsv, parsePointMapCsv, pointMapToCsv } from './csv';

const demo = cellDocumentSchema.parse(pickAndPlaceCell);
const HEADER = 'row_id,family,first_point,count,rack,slot,first_channel,bits,encoding,labels,invert';

describe('point-map CSV', () => {
  it('round-trips labels with commas, quotes and bars, and inverted points', () => {
    const rows: PointMapRow[] = [
      {
        id: 'pm-do',
        family: 'DO',
        first: 4,
        count: 3,
        rack: 0,
        slot: 2,
        firstChannel: 0,
        points: [{ label: 'Ready, waiting' }, { label: 'Say "go"', invert: true }, { label: 'A|B' }],
      },
    ];
    const text = pointMapToCsv(rows);
    // RFC 4180 §2: fields holding commas or quotes are quoted, inner quotes doubled.
    expect(text.split('\r\n')[1]).toBe('pm-do,DO,4,3,0,2,0,,,"Ready, waiting|Say ""go""|A\\|B",5');
    const back = parsePointMapCsv(text);
    expect(back.errors).toEqual([]);
    expect(back.rows).toEqual(rows);
  });

  it('reads a missing column on row 1 and a field-count mismatch on the row it happens (header = row 1, common practice)', () => {
    const missing = parsePointMapCsv('family,first_point,count\nDI,1,1\n');
    expect(missing.errors.filter((e) => e.row === 1).map((e) => e.column).sort()).toEqual(['first_channel', 'rack', 'slot']);
    const short = parsePointMapCsv(`${HEADER}\npm-a,DI,1,1,0,1,0,,,,\npm-b,DI,2,1\n`);
    expect(short.errors.some((e) => e.row === 3)).toBe(true);
    expect(short.errors.some((e) => e.row === 2)).toBe(false);
  });

  it('checks that inverted points belong to the row and labels do not outnumber points', () => {
    const r = parsePointMapCsv(`${HEADER}\npm-a,DI,1,2,0,1,0,,,A|B|C,7\n`);
    expect(r.errors.map((e) => e.column).sort()).toEqual(['invert', 'labels']);
    expect(r.rows).toEqual([]);
  });

  it('the template parses without errors', () => {
    expect(parsePointMapCsv(csvTemplate('point-map')).errors).toEqual([]);
  });
});

describe('I/O-list CSV', () => {
  it('writes each endpoint kind in its notation', () => {
    expect(endpointText({ device: 'start', terminal: 'contact' })).toBe('start:contact');
    expect(endpointText({ plc: '%IX0.0' })).toBe('%IX0.0');
    expect(endpointText({ controller: { rack: 0, slot: 1, channel: 4 } })).toBe('R0/S1/C4');
  });

  it('round-trips the demo cell’s wiring', () => {
    const back = parseIoListCsv(ioListToCsv(demo.wiring), demo);
    expect(back.errors).toEqual([]);
    expect(back.rows).toEqual(demo.wiring);
  });

  it('resolves a controller point through the live point map', () => {
    // DI5 of the demo map is rack 1 slot 2, first channel 0 + 4 (simulator/demo/pick-and-place.ts, row pm-di).
    const r = parseIoListCsv('from,to\nestop:contact,DI5\n', demo);
    expect(r.errors).toEqual([]);
    expect(r.rows[0].to).toEqual({ controller: { rack: 1, slot: 2, channel: 4 } });
  });
});
