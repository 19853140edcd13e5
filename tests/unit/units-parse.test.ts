import { describe, expect, it } from 'vitest';
import { parseQuantity } from '@/lib/units';

const value = (text: string, unit: string, aliases?: string[]) => {
  const parsed = parseQuantity(text, unit, { aliases });
  if (!parsed.ok) throw new Error(`${text}: ${parsed.message}`);
  return parsed.value;
};
const problem = (text: string, unit: string) => {
  const parsed = parseQuantity(text, unit);
  if (parsed.ok) throw new Error(`${text} parsed as ${parsed.value}`);
  return parsed.message;
};

describe('parseQuantity', () => {
  // Prefix symbols and powers: BIPM, "The International System of Units (SI)", 9th edition, 2019, Table 7.
  it.each([
    ['4M', 'Hz', 4e6],
    ['4 MHz', 'Hz', 4e6],
    ['4MHz', 'Hz', 4e6],
    ['4 mhz', 'Hz', 4e-3],
    ['1.25M', 'Hz', 1.25e6],
    ['400 kHz', 'Hz', 400e3],
    ['400k', 'Hz', 400e3],
    ['2.412 GHz', 'Hz', 2.412e9],
    ['10.7e6', 'Hz', 10.7e6],
    ['1e-3 k', 'Hz', 1],
    ['-600 kHz', 'Hz', -600e3],
    ['+1.35M', 'Hz', 1.35e6],
    ['.5 M', 'Hz', 0.5e6],
    ['250 ms', 's', 0.25],
    ['12.5 µs', 's', 12.5e-6],
    ['12.5 us', 's', 12.5e-6],
    ['3n', 's', 3e-9],
    ['0.25', 's', 0.25],
    ['4,000,000', 'Hz', 4e6],
    ['  18 m ', 'FS', 0.018],
  ])('%s %s -> %d', (text, unit, expected) => {
    expect(value(text, unit)).toBe(expected);
  });

  it('keeps typed decimals exact when a prefix shifts them', () => {
    expect(value('0.1 MHz', 'Hz')).toBe(100000);
    expect(value('0.3k', 'Hz')).toBe(300);
  });

  it('reads log units and counts without prefixes', () => {
    expect(value('-3 dB', 'dB')).toBe(-3);
    expect(value('-3', 'dB')).toBe(-3);
    expect(value('-47 dBFS', 'dBFS')).toBe(-47);
    expect(value('2 deg', 'deg')).toBe(2);
    expect(value('12', 'bits')).toBe(12);
    expect(problem('-3 mdB', 'dB')).toMatch(/"mdB" is not a unit this field takes \(expected dB, e\.g\. -3 dB\)/);
    expect(problem('3 k', 'bits')).toMatch(/expected bits/);
  });

  it('accepts the aliases a field names', () => {
    expect(value('4 Msps', 'Hz', ['sps', 'S/s'])).toBe(4e6);
    expect(value('40 MS/s', 'Hz', ['sps', 'S/s'])).toBe(40e6);
    expect(parseQuantity('4 Msps', 'Hz').ok).toBe(false);
  });

  it.each([
    ['', 'Hz', /is empty: enter a number, e\.g\. 4 MHz/],
    ['   ', 'Hz', /is empty/],
    ['abc', 'Hz', /"abc" is not a number/],
    ['MHz', 'Hz', /"MHz" is not a number/],
    ['4 MHz extra', 'Hz', /"MHz extra" is not a unit/],
    ['4 X', 'Hz', /"X" is not a unit this field takes \(expected Hz with an optional SI prefix/],
    ['4 kV', 'Hz', /"kV" is not a unit/],
    ['4..5', 'Hz', /is not a unit|is not a number/],
    ['1,5 MHz', 'Hz', /decimal comma/],
    ['1e999', 'Hz', /too large/],
    ['4 dB', 'Hz', /"dB" is not a unit/],
  ])('rejects %j for %s', (text, unit, pattern) => {
    expect(problem(text, unit)).toMatch(pattern);
  });

  it('gives 0 rather than -0', () => {
    expect(Object.is(value('-0', 'Hz'), 0)).toBe(true);
  });
});
