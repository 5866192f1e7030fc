/**
 * A small streaming XML tokeniser for the few SpreadsheetML parts the .xlsx reader needs. It is not a general XML
 * parser: no DTDs, no CDATA sections (Excel writes none in these parts), comments and processing instructions are
 * skipped. Text arrives in chunks of any size; each complete tag or text run is handed on once, so memory stays at one
 * chunk plus one unfinished tag.
 */

/** A tag: its local name (namespace prefix dropped), whether it closes (</x>) or is empty (<x/>), and its raw attributes. */
export interface XmlTag {
  readonly name: string;
  readonly close: boolean;
  readonly empty: boolean;
  readonly attrs: string;
}

export interface XmlHandler {
  tag(t: XmlTag): void;
  /** Raw text between tags, entities still encoded. */
  text(raw: string): void;
}

const TOKEN = /<([^>]*)>|([^<]+)/g;

/** Feeds text chunks through `handler`; call end() after the last chunk. Cost O(characters). */
export class XmlStream {
  private pending = '';
  constructor(private readonly handler: XmlHandler) {}

  push(chunk: string): void {
    const buf = this.pending + chunk;
    // Everything up to the last '>' is complete tags and text; the rest waits for the next chunk. A text run that holds
    // a '>' may be handed on in two pieces, which the handlers accept (they append text).
    const cut = buf.lastIndexOf('>') + 1;
    this.pending = buf.slice(cut);
    this.run(buf.slice(0, cut));
    // Text after the last tag can be long (a huge text run): hand it on unless it may hold the start of a tag.
    const lt = this.pending.indexOf('<');
    if (lt !== 0) {
      const text = lt < 0 ? this.pending : this.pending.slice(0, lt);
      if (text.length > 0) this.handler.text(text);
      this.pending = lt < 0 ? '' : this.pending.slice(lt);
    }
  }

  end(): void {
    if (this.pending.length > 0 && !this.pending.startsWith('<')) this.handler.text(this.pending);
    this.pending = '';
  }

  private run(s: string): void {
    TOKEN.lastIndex = 0;
    for (let m = TOKEN.exec(s); m !== null; m = TOKEN.exec(s)) {
      const inner = m[1];
      if (inner === undefined) {
        this.handler.text(m[2]!);
        continue;
      }
      const first = inner.charCodeAt(0);
      if (first === 0x3f /* ? */ || first === 0x21 /* ! */) continue;
      const close = first === 0x2f; /* / */
      const empty = !close && inner.endsWith('/');
      const body = close ? inner.slice(1) : empty ? inner.slice(0, -1) : inner;
      const sp = body.search(/\s/);
      const qname = sp < 0 ? body : body.slice(0, sp);
      const colon = qname.indexOf(':');
      this.handler.tag({ name: colon < 0 ? qname : qname.slice(colon + 1), close, empty, attrs: sp < 0 ? '' : body.slice(sp) });
    }
  }
}

/** The value of one attribute in a tag's raw attribute text, decoded; the namespace prefix is ignored (r:id → id). */
export function attr(attrs: string, name: string): string | undefined {
  const re = /([\w.:-]+)\s*=\s*(?:"([^"]*)"|'([^']*)')/g;
  for (let m = re.exec(attrs); m !== null; m = re.exec(attrs)) {
    const q = m[1]!;
    const local = q.slice(q.indexOf(':') + 1);
    if (local === name) return decodeXml(m[2] ?? m[3] ?? '');
  }
  return undefined;
}

const NAMED: Record<string, string> = { lt: '<', gt: '>', amp: '&', quot: '"', apos: "'" };

/**
 * Decodes XML character references (the five named ones, &#NNN; and &#xHH;) and SpreadsheetML's _xHHHH_ escapes
 * (ECMA-376 Part 1, ST_Xstring: a character XML cannot hold, e.g. _x000D_ for a carriage return; _x005F_ escapes the
 * underscore itself). Unknown references are kept as written.
 * Example: decodeXml('a &amp; b_x000D_') → 'a & b\r'
 */
export function decodeXml(raw: string): string {
  let s = raw;
  if (s.includes('&')) {
    s = s.replace(/&(#x[0-9a-fA-F]+|#[0-9]+|[a-z]+);/g, (whole, ref: string) => {
      if (ref.startsWith('#')) {
        const code = ref[1] === 'x' ? parseInt(ref.slice(2), 16) : parseInt(ref.slice(1), 10);
        return code <= 0x10ffff ? String.fromCodePoint(code) : whole;
      }
      return NAMED[ref] ?? whole;
    });
  }
  if (s.includes('_x')) s = s.replace(/_x([0-9a-fA-F]{4})_/g, (_w, h: string) => String.fromCharCode(parseInt(h, 16)));
  return s;
}
