import { describe, expect, it } from 'vitest';
import { acceptedNumber } from './number-cell';

// Number() parsing rules are ECMAScript's StringToNumber (ECMA-262, 7.1.4.1.1): '' and
// whitespace are 0, '0x10' is 16, '1e3' is 1000. A table cell must not take a cleared field as 0.
describe('acceptedNumber', () => {
  const slot = { min: 0, max: 15, integer: true };
  it('refuses an empty or blank field instead of reading it as 0', () => {
    expect(acceptedNumber('', slot)).toBeNull();
    expect(acceptedNumber('   ', slot)).toBeNull();
    expect(acceptedNumber('', { min: -1000, max: 1000 })).toBeNull();
  });
  it('takes whole numbers in range for integer cells and refuses fractions and out-of-range values', () => {
    expect(acceptedNumber('0', slot)).toBe(0);
    expect(acceptedNumber(' 7 ', slot)).toBe(7);
    expect(acceptedNumber('15', slot)).toBe(15);
    expect(acceptedNumber('16', slot)).toBeNull();
    expect(acceptedNumber('-1', slot)).toBeNull();
    expect(acceptedNumber('2.5', slot)).toBeNull();
    expect(acceptedNumber('abc', slot)).toBeNull();
  });
  it('takes finite decimals for pose cells, with an exclusive minimum when asked', () => {
    expect(acceptedNumber('12.5', { min: -500, max: 500 })).toBe(12.5);
    expect(acceptedNumber('Infinity', { min: -Infinity, max: Infinity })).toBeNull();
    expect(acceptedNumber('0', { min: 0, max: 100, exclusiveMin: true })).toBeNull();
    expect(acceptedNumber('0.1', { min: 0, max: 100, exclusiveMin: true })).toBe(0.1);
  });
});
