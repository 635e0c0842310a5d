import { describe, expect, it } from 'vitest';
import { DRILL_LIBRARY } from '@/lib/drills/library';
import { drillInputSchema } from '@/lib/schemas/drills';
import { formPath, parseValue, toDrillInput, toFormValues } from './drill-form';

const CELL = '00000000-0000-4000-8000-000000000001';

describe('drill form conversion', () => {
  it('round-trips every built-in drill without loss (compound conditions kept as the builder’s tree)', () => {
    for (const d of DRILL_LIBRARY) {
      const input = drillInputSchema.parse({ ...d.input, cellId: CELL, cellVersion: 1 });
      const back = drillInputSchema.parse(toDrillInput(toFormValues(input, { cellId: CELL, cellVersion: 1 })));
      expect(back, d.key).toEqual(input);
    }
  });

  it('types condition values and maps server field paths onto the form', () => {
    expect(parseValue('0')).toBe(0);
    expect(parseValue('true')).toBe(true);
    expect(parseValue('running')).toBe('running');
    expect(formPath('rules.2.rule.p.signal')).toBe('rules.2.p');
    expect(formPath('rules.0.rule.event.all.1.signal')).toBe('rules.0.event');
    expect(formPath('faults.3.when.not.signal')).toBe('faults.3.when');
    expect(formPath('faults.0.rows.1')).toBe('faults.0.row2');
    expect(formPath('answer.location')).toBe('answerLocation');
  });
});
