/**
 * Numbers typed into the notebook's fields: SI prefixes where the unit takes them, plain numbers
 * for levels and counts, and the text written back for a value reads to the same number.
 * Prefix powers: SI brochure, 9th edition (BIPM 2019), Table 7.
 */
import { describe, expect, it } from 'vitest';
import { formatFieldNumber, parseFieldNumber, parseNumberList } from '@/components/chains/form-values';

describe('parseFieldNumber: good text', () => {
  it.each([
    ['1.25M', 'Hz', 1_250_000],
    ['1.25 MHz', 'Hz', 1_250_000],
    ['400 kHz', 'Hz', 400_000],
    ['400k', 'Hz', 400_000],
    ['-600 kHz', 'Hz', -600_000],
    ['2.4G', 'Hz', 2.4e9],
    ['0.1 MHz', 'Hz', 100_000],
    ['10.7e6', 'Hz', 10.7e6],
    ['4,000,000', 'Hz', 4e6],
    ['250 ms', 's', 0.25],
    ['250u', 's', 250e-6],
    ['-3 dB', 'dB', -3],
    ['-3', 'dB', -3],
    ['-20 dBFS', 'dBFS', -20],
    ['12 deg', 'deg', 12],
    ['64k', 'samples', 64_000],
    ['127', 'samples', 127],
    ['2048 samples', 'samples', 2048],
    ['0.5', '', 0.5],
  ])('%j in %s is %d', (text, unit, value) => {
    expect(parseFieldNumber(text, unit)).toEqual({ ok: true, value });
  });
});

describe('parseFieldNumber: bad text', () => {
  it.each([
    ['', 'Hz', /is empty/],
    ['   ', 'dB', /is empty/],
    ['abc', 'Hz', /"abc" is not a number/],
    ['1.2.3', 'Hz', /not a unit this field takes/],
    ['1,5 MHz', 'Hz', /decimal comma/],
    ['4 MdB', 'dB', /not a unit this field takes/],
    ['3 kdB', 'dB', /not a unit this field takes/],
    ['5 Mrad', 'deg', /not a unit this field takes/],
    ['400 kS', 'Hz', /not a unit this field takes/],
    ['1e999', 'Hz', /too large/],
    ['--3', 'dB', /not a number/],
  ])('%j in %s fails', (text, unit, message) => {
    const read = parseFieldNumber(text, unit);
    expect(read.ok).toBe(false);
    if (!read.ok) expect(read.message).toMatch(message);
  });
});

describe('formatFieldNumber round trip', () => {
  it.each([
    [1_250_000, 'Hz', '1.25 MHz'],
    [-600_000, 'Hz', '-600 kHz'],
    [10.7e6, 'Hz', '10.7 MHz'],
    [2.4e9, 'Hz', '2.4 GHz'],
    [0, 'Hz', '0 Hz'],
    [512, 'Hz', '512 Hz'],
    [0.00025, 's', '250 µs'],
    [-3, 'dB', '-3'],
    [262_144, 'samples', '262144'],
    [8.6, '', '8.6'],
  ])('%d %s is written %j', (value, unit, text) => {
    expect(formatFieldNumber(value, unit)).toBe(text);
    expect(parseFieldNumber(text, unit)).toEqual({ ok: true, value });
  });

  it('reads back every written value exactly, including awkward ones', () => {
    for (const value of [1_234_567.891, 4e6 / 3, 0.1 + 0.2, 1e-7, 999_999.9999, 123_456_789_012]) {
      const text = formatFieldNumber(value, 'Hz');
      expect(parseFieldNumber(text, 'Hz')).toEqual({ ok: true, value });
    }
  });
});

describe('parseNumberList', () => {
  it('reads numbers separated by commas, spaces, semicolons and new lines', () => {
    expect(parseNumberList('0.1, 0.2;0.3\n-4e-2 [5]')).toEqual({ ok: true, values: [0.1, 0.2, 0.3, -0.04, 5] });
  });
  it('rejects an empty list and names a bad entry', () => {
    expect(parseNumberList('  ')).toEqual({ ok: false, message: 'is empty: paste at least one number' });
    expect(parseNumberList('1, 2, three')).toEqual({ ok: false, message: 'entry 3 ("three") is not a number' });
  });
});
