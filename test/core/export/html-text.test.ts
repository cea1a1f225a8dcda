// Escaping for the HTML and SVG exports (src/core/export/html-text.ts). Source:
// the HTML Living Standard's character references &amp; &lt; &gt; &quot; &#39;
// (from memory); the property that matters: escaped text parses back to itself.
import { describe, expect, it } from 'vitest';
import { escapeHtml, escapeText } from '../../../src/core/export/html-text.ts';

const unescape = (s: string) => s.replace(/&lt;/g, '<').replace(/&gt;/g, '>').replace(/&quot;/g, '"').replace(/&#39;/g, "'").replace(/&amp;/g, '&');

describe('escapeHtml', () => {
  it('escapes the five characters that end text or an attribute; & first, so nothing is escaped twice', () => {
    expect(escapeHtml(`<a href="x" title='y'>R&D</a>`)).toBe('&lt;a href=&quot;x&quot; title=&#39;y&#39;&gt;R&amp;D&lt;/a&gt;');
    expect(escapeHtml('&lt;')).toBe('&amp;lt;');
    expect(escapeHtml(3.5)).toBe('3.5');
  });

  it('leaves no < > " \' and reads back to the input for hostile names', () => {
    for (const t of ['"><script>alert(1)</script>', "x' onload='y", 'µAU · min, 1 < 2 & 3 > 2', '']) {
      const e = escapeHtml(t);
      expect(e).not.toMatch(/[<>"']/);
      expect(unescape(e)).toBe(t);
    }
  });
});

describe('escapeText', () => {
  it('escapes & < > and keeps quotes, so JSON in a <pre> reads as written', () => {
    expect(escapeText('{"a": "<b>"}')).toBe('{"a": "&lt;b&gt;"}');
    expect(unescape(escapeText('a & "b" < c'))).toBe('a & "b" < c');
  });
});
