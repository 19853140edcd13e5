import { describe, expect, it } from 'vitest';
import { createElement } from 'react';
import { renderToStaticMarkup } from 'react-dom/server';
import { Quantity } from '@/components/Quantity';

describe('Quantity (React)', () => {
  it('renders the prefixed value in the monospace face with tabular digits and the exact value on hover', () => {
    const html = renderToStaticMarkup(createElement(Quantity, { value: 1.25e6, unit: 'Hz' }));
    expect(html).toContain('font-mono');
    expect(html).toContain('tabular-nums');
    expect(html).toContain('title="1250000 Hz"');
    // The digits and the prefixed unit, as formatQuantity gives them (SI brochure, 9th edition, Table 7).
    expect(html.replace(/<[^>]+>/g, '')).toBe('1.25 MHz');
  });

  it('passes formatting options through', () => {
    const html = renderToStaticMarkup(createElement(Quantity, { value: 600e3, unit: 'Hz', signed: true }));
    expect(html.replace(/<[^>]+>/g, '')).toBe('+600 kHz');
  });

  it('has no hover value for a missing measurement', () => {
    const html = renderToStaticMarkup(createElement(Quantity, { value: NaN, unit: 'dBFS' }));
    expect(html).not.toContain('title=');
    expect(html.replace(/<[^>]+>/g, '')).toBe('—');
  });
});
