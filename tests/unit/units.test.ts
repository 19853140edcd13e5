import { describe, expect, it } from 'vitest';
import { formatBytes, formatDuration, formatQuantity, quantityParts } from '@/lib/units';

describe('formatQuantity with SI prefixes', () => {
  // Prefix symbols and powers: BIPM, "The International System of Units (SI)", 9th edition, 2019, Table 7.
  it.each([
    [1.25e6, 'Hz', '1.25 MHz'],
    [2.4e9, 'Hz', '2.4 GHz'],
    [600e3, 'Hz', '600 kHz'],
    [10.7e6, 'Hz', '10.7 MHz'],
    [4e6, 'sps', '4 Msps'],
    [40e6, 'S/s', '40 MS/s'],
    [1e12, 'Hz', '1 THz'],
    [0.25, 's', '250 ms'],
    [12.5e-6, 's', '12.5 µs'],
    [3e-9, 's', '3 ns'],
    [4.7e-12, 'F', '4.7 pF'],
    [1, 'V', '1 V'],
    [999, 'Hz', '999 Hz'],
    [0, 'Hz', '0 Hz'],
  ])('%d %s -> %s', (value, unit, expected) => {
    expect(formatQuantity(value, unit)).toBe(expected);
  });

  it('keeps four significant digits by default and drops trailing zeros', () => {
    expect(formatQuantity(1234567, 'Hz')).toBe('1.235 MHz');
    expect(formatQuantity(1_000_000, 'Hz')).toBe('1 MHz');
    expect(formatQuantity(1234567, 'Hz', { significant: 7 })).toBe('1.234567 MHz');
    expect(formatQuantity(1234567, 'Hz', { significant: 2 })).toBe('1.2 MHz');
  });

  it('never rounds the integer part away', () => {
    expect(formatQuantity(123456, 'Hz', { significant: 2 })).toBe('123 kHz');
  });

  it('carries a rounding overflow into the next prefix', () => {
    expect(formatQuantity(999_960, 'Hz')).toBe('1 MHz');
    expect(formatQuantity(999.96e-3, 's')).toBe('1 s');
  });

  it('shows negative values and optional plus signs for offsets', () => {
    expect(formatQuantity(-600e3, 'Hz')).toBe('-600 kHz');
    expect(formatQuantity(600e3, 'Hz', { signed: true })).toBe('+600 kHz');
    expect(formatQuantity(0, 'Hz', { signed: true })).toBe('0 Hz');
  });

  it('splits number and prefixed unit for styling', () => {
    expect(quantityParts(1.25e6, 'Hz')).toEqual({ number: '1.25', unit: 'MHz', text: '1.25 MHz' });
  });
});

describe('formatQuantity with logarithmic and plain units', () => {
  // dB values never take SI prefixes: a decibel is already a logarithmic ratio (common practice).
  it.each([
    [-3, 'dB', '-3 dB'],
    [-3.0103, 'dB', '-3.01 dB'],
    [-62.45, 'dBFS', '-62.45 dBFS'],
    [-62.456, 'dBFS', '-62.46 dBFS'],
    [-140.2, 'dBFS/Hz', '-140.2 dBFS/Hz'],
    [10, 'dBm', '10 dBm'],
    [35, 'dBc', '35 dBc'],
    [2, '°', '2°'], // SI brochure, 9th edition, 2019, 5.4.3: no space before the degree sign
    [99, '%', '99 %'],
    [262144, 'samples', '262,144 samples'],
  ])('%d %s -> %s', (value, unit, expected) => {
    expect(formatQuantity(value, unit)).toBe(expected);
  });

  it('honours a chosen number of decimals', () => {
    expect(formatQuantity(-3.0103, 'dB', { decimals: 1 })).toBe('-3 dB');
    expect(formatQuantity(0.3, 'dB', { decimals: 1, signed: true })).toBe('+0.3 dB');
  });

  it('does not print "-0" for a value that rounds to zero', () => {
    expect(formatQuantity(-0.001, 'dB')).toBe('0 dB');
  });

  it('shows infinities and missing values plainly', () => {
    expect(formatQuantity(-Infinity, 'dBFS')).toBe('-∞ dBFS');
    expect(formatQuantity(NaN, 'Hz')).toBe('—');
  });
});

describe('byte sizes', () => {
  // Binary prefixes Ki, Mi, Gi are powers of 1024: IEC 80000-13:2008, clause 4.
  it.each([
    [0, '0 B'],
    [1023, '1023 B'],
    [1536, '1.5 KiB'],
    [3 * 2 ** 20, '3 MiB'],
    [1.25 * 2 ** 30, '1.25 GiB'],
    [2 ** 40, '1 TiB'],
    [123.4 * 2 ** 20, '123 MiB'],
  ])('%d bytes -> %s', (bytes, expected) => {
    expect(formatBytes(bytes)).toBe(expected);
    expect(formatQuantity(bytes, 'B')).toBe(expected);
  });

  it('carries 1023.99 KiB to 1 MiB', () => {
    expect(formatBytes(2 ** 20 - 5)).toBe('1 MiB');
  });
});

describe('durations', () => {
  it.each([
    [0.0125, '12.5 ms'],
    [42, '42 s'],
    [90, '1 min 30 s'],
    [3600 + 5 * 60, '1 h 05 min'],
    [2 * 86_400 + 3 * 3600, '2 d 03 h'],
  ])('%d s -> %s', (seconds, expected) => {
    expect(formatDuration(seconds)).toBe(expected);
  });

  it('formats seconds above a minute as a duration through formatQuantity too', () => {
    expect(formatQuantity(125, 's')).toBe('2 min 05 s');
  });
});
