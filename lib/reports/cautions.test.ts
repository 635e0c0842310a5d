import { createElement } from 'react';
import { renderToStaticMarkup } from 'react-dom/server';
import { describe, expect, it } from 'vitest';
import { ChangeoverCaution } from '@/components/changeovers/changeover-caution';
import { PRINTED_CHANGEOVER_CAUTION, PRINTED_SAFETY_CAUTION } from './cautions';

/** The caution as a reader sees it on the changeover pages: the markup's text, entities decoded, spaces collapsed. */
function screenText(): string {
  return renderToStaticMarkup(createElement(ChangeoverCaution))
    .replace(/<[^>]+>/g, ' ')
    .replace(/&#x27;/g, "'")
    .replace(/&quot;/g, '"')
    .replace(/&amp;/g, '&')
    .replace(/\s+/g, ' ');
}

describe('printed cautions', () => {
  it('say word for word what the changeover pages say', () => {
    const text = screenText();
    expect(text).toContain(PRINTED_SAFETY_CAUTION);
    for (const line of PRINTED_CHANGEOVER_CAUTION) expect(text).toContain(line);
  });
});
