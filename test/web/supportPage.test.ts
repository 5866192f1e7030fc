// @vitest-environment jsdom
import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { CAUTIONS } from '../../src/core/report/cautions';

const PAGE = resolve(__dirname, '../../assets/support.html');

/** The support page's cautions list, each item's text with white space collapsed. */
function cautionItems(): string[] {
  const doc = new DOMParser().parseFromString(readFileSync(PAGE, 'utf8'), 'text/html');
  return [...doc.querySelectorAll('ul.cautions li')].map((li) => (li.textContent ?? '').replace(/\s+/g, ' ').trim());
}

describe('the support page (assets/support.html, the manifest help link)', () => {
  it('shows the three cautions of the result sheets in full, in the same words and order', () => {
    expect(CAUTIONS).toHaveLength(3);
    expect(cautionItems()).toEqual([...CAUTIONS]);
  });
});
