// Escaping of text and attribute values for the XHTML report: every journal and rig string is user input.

// Characters XML 1.0 forbids (C0 controls other than tab/LF/CR, lone surrogates, U+FFFE/U+FFFF): a journal
// read as latin1 may carry any byte, and one such character would make the whole page ill-formed.
const FORBIDDEN = /[\u0000-\u0008\u000B\u000C\u000E-\u001F\uFFFE\uFFFF]|[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/g;

/** Text safe inside an element or a double- or single-quoted attribute; forbidden characters become U+FFFD. */
export function esc(s: string): string {
  return s
    .replace(FORBIDDEN, '\uFFFD')
    .replace(/&/g, '&amp;')
    .replace(/</g, '&lt;')
    .replace(/>/g, '&gt;')
    .replace(/"/g, '&quot;')
    .replace(/'/g, '&#39;');
}
