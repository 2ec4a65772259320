import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { XMLParser, XMLValidator } from 'fast-xml-parser';
import { esc } from '../../host/report/escape.ts';

// XML 1.0 (Fifth Edition) §2.2 "Char": tab, LF, CR, U+0020–U+D7FF, U+E000–U+FFFD, U+10000–U+10FFFF.
const xmlChar = (cp: number): boolean => cp === 9 || cp === 10 || cp === 13 || (cp >= 0x20 && cp <= 0xd7ff) || (cp >= 0xe000 && cp <= 0xfffd) || cp >= 0x10000;

const parser = new XMLParser({ ignoreAttributes: false, processEntities: true, htmlEntities: true, parseTagValue: false, parseAttributeValue: false, trimValues: false });

// Any UTF-16 string, lone surrogates and C0 controls included: a journal read as latin1 can carry any byte.
const anyText = fc.string({ unit: fc.integer({ min: 0, max: 0xffff }).map((c) => String.fromCharCode(c)), maxLength: 40 });

describe('escaping of user strings', () => {
  it('any string becomes text that is well-formed XML in an element and in an attribute, and reads back', () => {
    fc.assert(
      fc.property(anyText, (s) => {
        const e = esc(s);
        for (const ch of e) expect(xmlChar(ch.codePointAt(0)!)).toBe(true);
        const doc = `<p a="${e}" b='${e}'>x${e}x</p>`;
        expect(XMLValidator.validate(doc)).toBe(true);
        // What a reader sees: the input with XML-forbidden characters replaced by U+FFFD, line ends
        // normalised to LF as every XML parser does (XML 1.0 §2.11).
        const cleaned = [...s]
          .map((ch) => (xmlChar(ch.codePointAt(0)!) ? ch : '\ufffd')) // a lone surrogate's code point is not a Char
          .join('')
          .replace(/\r\n?/g, '\n');
        const back = parser.parse(doc).p;
        expect(back['@_a'].replace(/\r\n?/g, '\n')).toBe(cleaned);
        expect(back['#text'].replace(/\r\n?/g, '\n')).toBe(`x${cleaned}x`);
      }),
      { numRuns: 300 },
    );
  });

  it('markup in a rig name or journal line cannot open an element', () => {
    const e = esc('<script>alert("x")</script> & <svg onload=1>');
    expect(e).not.toMatch(/[<>"]/);
    expect(e).toBe('&lt;script&gt;alert(&quot;x&quot;)&lt;/script&gt; &amp; &lt;svg onload=1&gt;');
  });

  it('keeps a valid surrogate pair (characters beyond the BMP) intact', () => {
    expect(esc('pendulum \u{1F570}')).toBe('pendulum \u{1F570}');
  });
});
