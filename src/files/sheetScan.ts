/**
 * The worksheet part read as a stream of bytes: the inflated sheet XML is scanned chunk by chunk for the few elements
 * that carry cells (ECMA-376 Part 1, section numbers from memory: §18.3.1.73 row with its r attribute, §18.3.1.4 c with
 * r, t (ST_CellType, §18.18.11) and s, §18.3.1.96 v, §18.3.1.53 is with t and rPh for inline strings), and each cell
 * with a value goes straight into typed arrays (xlsxCells.ts) without a string per tag, an object per cell or a grid.
 * It follows the rules of the tokeniser it replaces (xml.ts, kept for the small parts) exactly: a tag is '<' up to the
 * next '>', its local name drops a namespace prefix, comments and processing instructions are skipped, a value is the
 * text of v (outside is) or of the t elements of is outside rPh, entities and _xHHHH_ escapes decoded (decodeXml).
 * Texts are decoded from UTF-8 run by run, as a streaming decoder would give them. Numbers and shared-string indices
 * are parsed from the bytes when they are plain decimals (Clinger 1990's exact case: at most 15 digits and a power of
 * ten up to 1e22, so one IEEE operation gives the correctly rounded value, the same double as Number(text));
 * anything else takes the text path. Cost O(bytes); memory O(stored cells + distinct texts + one chunk).
 */
import { attr, decodeXml } from './xml';
import { KIND_FALSE, KIND_NUMBER, KIND_SHARED, KIND_TEXT, KIND_TRUE } from './xlsxCells';

const LT = 0x3c;
const GT = 0x3e;
const SLASH = 0x2f;
const COLON = 0x3a;
const QUOTE = 0x22;
const APOS = 0x27;
const EQ = 0x3d;

/** Cell types (ST_CellType) as the reader treats them. */
const T_N = 0; // n, or "" (a number)
const T_S = 1; // s: shared string
const T_B = 2; // b: boolean
const T_INLINE = 3; // inlineStr
const T_OTHER = 4; // str (formula text), e (error value), d (ISO 8601 date text), anything else: text as written

const POW10 = [1e0, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19, 1e20, 1e21, 1e22];

const decoder = new TextDecoder('utf-8', { ignoreBOM: true });

/** Bytes [s, e) as text: plain ASCII directly, anything else through the UTF-8 decoder (a fresh string either way). */
function decodeRun(buf: Uint8Array, s: number, e: number): string {
  if (e - s <= 64) {
    let ascii = true;
    for (let i = s; i < e; i++) {
      if (buf[i]! >= 0x80) {
        ascii = false;
        break;
      }
    }
    if (ascii) return String.fromCharCode.apply(null, buf.subarray(s, e) as unknown as number[]);
  }
  return decoder.decode(buf.subarray(s, e));
}

/** JavaScript's \s within ASCII (tab, line feed, vertical tab, form feed, carriage return, space). */
const isSpace = (c: number): boolean => c === 0x20 || (c >= 0x09 && c <= 0x0d);

/** The end of the last complete UTF-8 character in buf[from, end): a sequence cut by the chunk waits for the next. */
function utf8Cut(buf: Uint8Array, from: number, end: number): number {
  for (let k = end - 1; k >= Math.max(from, end - 3); k--) {
    const b = buf[k]!;
    if (b < 0x80) return end;
    if (b >= 0xc0) {
      const need = b >= 0xf0 ? 4 : b >= 0xe0 ? 3 : 2;
      return end - k >= need ? end : k;
    }
  }
  return end;
}

/** The type code of a t attribute's (decoded) text. */
function typeCode(t: string | undefined): number {
  if (t === undefined || t === 'n' || t === '') return T_N;
  if (t === 's') return T_S;
  if (t === 'b') return T_B;
  if (t === 'inlineStr') return T_INLINE;
  return T_OTHER;
}

/** Growable typed arrays of the cells found, in the order found. */
export class FoundCells {
  rows: Int32Array;
  /** Columns, 1-based (a worksheet has at most 16,384). */
  cols: Uint16Array;
  kinds: Uint8Array;
  nums: Float64Array;
  length = 0;
  /** Texts other than shared strings (inline strings, formula text, error values), each distinct text once. */
  readonly texts: string[] = [];
  private readonly textIndex = new Map<string, number>();
  longestText = 0;
  /** True while every cell came after the one before it (row, then column): the usual order, needing no sort. */
  ordered = true;
  private lastKey = -1;

  /** `capacity`: cells to make room for at once. Room that is never written costs address space, not memory (the
   * platform hands out zeroed pages as they are first touched), so an estimate on the high side is cheap and saves
   * the copies of growing. */
  constructor(capacity = 1 << 14) {
    this.rows = new Int32Array(capacity);
    this.cols = new Uint16Array(capacity);
    this.kinds = new Uint8Array(capacity);
    this.nums = new Float64Array(capacity);
  }

  private grow(): void {
    const n = this.rows.length * 2;
    const rows = new Int32Array(n);
    rows.set(this.rows);
    this.rows = rows;
    const cols = new Uint16Array(n);
    cols.set(this.cols);
    this.cols = cols;
    const kinds = new Uint8Array(n);
    kinds.set(this.kinds);
    this.kinds = kinds;
    const nums = new Float64Array(n);
    nums.set(this.nums);
    this.nums = nums;
  }

  push(row: number, col: number, kind: number, num: number): void {
    if (this.length === this.rows.length) this.grow();
    const k = this.length++;
    this.rows[k] = row;
    this.cols[k] = col;
    this.kinds[k] = kind;
    this.nums[k] = num;
    const key = row * 16_385 + col;
    if (key <= this.lastKey) this.ordered = false;
    this.lastKey = key;
  }

  pushText(row: number, col: number, text: string): void {
    let i = this.textIndex.get(text);
    if (i === undefined) {
      i = this.texts.length;
      this.texts.push(text);
      this.textIndex.set(text, i);
      if (text.length > this.longestText) this.longestText = text.length;
    }
    this.push(row, col, KIND_TEXT, i);
  }
}

/** What the scanner needs from the reader: the shared strings and how to refuse a cell past a worksheet's limits. */
export interface ScanContext {
  readonly strings: readonly string[];
  readonly rowsMax: number;
  readonly columnsMax: number;
  past(where: string): Error;
}

/**
 * A scanner for one worksheet part: push() each inflated chunk as it comes, then end(). The cells with a value are in
 * `found`. Throws ctx.past(...) for a row or cell past the worksheet's limits, as soon as it is met.
 */
export class SheetScanner {
  readonly found: FoundCells;
  private pending: Uint8Array = new Uint8Array(0);
  private row = 0;
  private col = 0;
  private type = T_N;
  private inCell = false;
  private inIs = false;
  private inPh = 0;
  /** 0: not collecting; 1: text of v; 2: text of t. */
  private collect = 0;
  /** The value's text: one run as a byte range of the current buffer (the common case), or as a string. */
  private runStart = -1;
  private runEnd = -1;
  private raw: string | null = null;
  private buf: Uint8Array = this.pending;

  /** `expectedBytes`: the part's inflated size as far as known (it sizes the first room for cells). */
  constructor(
    private readonly ctx: ScanContext,
    expectedBytes = 0,
  ) {
    // A cell with a value takes at least 15 bytes of XML (<c><v>1</v></c>); most take 30 or more.
    this.found = new FoundCells(Math.max(1 << 14, Math.min(Math.ceil(expectedBytes / 24), 1 << 25)));
  }

  push(chunk: Uint8Array): void {
    // Everything up to the last '>' is complete tags and text; the rest waits for the next chunk, except text before
    // its first '<' (which can be long), handed on now up to its last complete character. What waits is joined to
    // the new chunk's bytes up to its first '>' only, so the chunk itself is read where it lies.
    let start = 0;
    if (this.pending.length > 0) {
      let g = 0;
      while (g < chunk.length && chunk[g] !== GT) g++;
      const head = g < chunk.length ? g + 1 : chunk.length;
      const joined = new Uint8Array(this.pending.length + head);
      joined.set(this.pending);
      joined.set(chunk.subarray(0, head), this.pending.length);
      this.pending = new Uint8Array(0);
      if (head === chunk.length) {
        this.tail(joined);
        return;
      }
      this.buf = joined;
      this.run(joined, 0, joined.length);
      this.settleRun();
      start = head;
    }
    this.tail(chunk, start);
  }

  /** Reads buf[start..] up to its last '>', then keeps the rest as `pending` under the rule above. */
  private tail(buf: Uint8Array, start = 0): void {
    this.buf = buf;
    let cut = buf.length;
    while (cut > start && buf[cut - 1] !== GT) cut--;
    this.run(buf, start, cut);
    let lt = cut;
    while (lt < buf.length && buf[lt] !== LT) lt++;
    let keep = lt;
    if (lt > cut) {
      const end = lt < buf.length ? lt : utf8Cut(buf, cut, buf.length);
      if (end > cut) this.text(buf, cut, end);
      keep = end;
    }
    this.settleRun();
    this.pending = buf.slice(keep);
  }

  end(): void {
    const p = this.pending;
    this.buf = p;
    if (p.length > 0 && p[0] !== LT) this.text(p, 0, p.length);
    this.settleRun();
    this.pending = new Uint8Array(0);
  }

  /** Moves a value's byte range into a string before its buffer is left. */
  private settleRun(): void {
    if (this.runStart >= 0) {
      this.raw = (this.raw ?? '') + decodeRun(this.buf, this.runStart, this.runEnd);
      this.runStart = -1;
    }
  }

  private text(buf: Uint8Array, s: number, e: number): void {
    if (this.collect === 0) return;
    if (this.runStart < 0 && this.raw === null) {
      this.runStart = s;
      this.runEnd = e;
      return;
    }
    this.settleRun();
    this.raw = (this.raw ?? '') + decodeRun(buf, s, e);
  }

  private run(buf: Uint8Array, start: number, cut: number): void {
    let i = start;
    while (i < cut) {
      if (buf[i] !== LT) {
        let j = i + 1;
        while (j < cut && buf[j] !== LT) j++;
        if (this.collect !== 0) this.text(buf, i, j);
        i = j;
        continue;
      }
      // The commonest tags by their bytes (<v>, </v>, </c>), with the same effect as through tag(); a '>' found
      // here lies before `cut`, as every '>' of the buffer does.
      const b1 = buf[i + 1];
      if (b1 === 0x76 /* v */ && buf[i + 2] === GT) {
        this.collect = this.inCell && !this.inIs ? 1 : 0;
        i += 3;
        continue;
      }
      if (b1 === SLASH && buf[i + 3] === GT) {
        const b2 = buf[i + 2];
        if (b2 === 0x76 /* v */) {
          this.collect = 0;
          i += 4;
          continue;
        }
        if (b2 === 0x63 /* c */) {
          if (this.inCell) this.finishCell();
          this.inCell = false;
          i += 4;
          continue;
        }
      }
      if (b1 === 0x63 /* c */ && buf[i + 2] === 0x20) {
        const next = this.fastCell(buf, i + 3);
        if (next > 0) {
          i = next;
          continue;
        }
      }
      let gt = i + 1;
      while (buf[gt] !== GT) gt++;
      this.tag(buf, i + 1, gt);
      i = gt + 1;
    }
  }

  /** One tag, inner bytes [s, e) (between '<' and '>'). */
  private tag(buf: Uint8Array, s: number, e: number): void {
    const first = buf[s];
    if (first === 0x3f /* ? */ || first === 0x21 /* ! */) return;
    const close = first === SLASH;
    const empty = !close && e > s && buf[e - 1] === SLASH;
    const p = close ? s + 1 : s;
    const end = empty ? e - 1 : e;
    let q = p;
    let colon = -1;
    for (; q < end; q++) {
      const c = buf[q]!;
      if (isSpace(c)) break;
      if (c >= 0x80) return this.slowTag(buf, s, e);
      if (c === COLON && colon < 0) colon = q;
    }
    const ls = colon < 0 ? p : colon + 1;
    const len = q - ls;
    const a = buf[ls];
    if (len === 1) {
      if (a === 0x63 /* c */) this.cellTag(close, empty, buf, q, end, null);
      else if (a === 0x76 /* v */) this.collect = !close && !empty && this.inCell && !this.inIs ? 1 : 0;
      else if (a === 0x74 /* t */) this.collect = !close && !empty && this.inIs && this.inPh === 0 ? 2 : 0;
    } else if (len === 2) {
      if (a === 0x69 /* i */ && buf[ls + 1] === 0x73 /* s */) this.inIs = !close && !empty;
    } else if (len === 3) {
      if (a === 0x72 /* r */ && buf[ls + 1] === 0x6f /* o */ && buf[ls + 2] === 0x77 /* w */) {
        if (!close) this.rowBytes(buf, q, end);
      } else if (a === 0x72 /* r */ && buf[ls + 1] === 0x50 /* P */ && buf[ls + 2] === 0x68 /* h */) {
        if (!empty) this.inPh += close ? -1 : 1;
      }
    }
  }

  /** A tag whose name holds a non-ASCII byte: decoded and split as the string tokeniser does. */
  private slowTag(buf: Uint8Array, s: number, e: number): void {
    const inner = decoder.decode(buf.subarray(s, e));
    const close = inner.charCodeAt(0) === SLASH;
    const empty = !close && inner.endsWith('/');
    const body = close ? inner.slice(1) : empty ? inner.slice(0, -1) : inner;
    const sp = body.search(/\s/);
    const qname = sp < 0 ? body : body.slice(0, sp);
    const colon = qname.indexOf(':');
    const name = colon < 0 ? qname : qname.slice(colon + 1);
    const attrs = sp < 0 ? '' : body.slice(sp);
    switch (name) {
      case 'row':
        if (!close) this.rowTag(attr(attrs, 'r'));
        break;
      case 'c':
        this.cellTag(close, empty, buf, 0, 0, attrs);
        break;
      case 'v':
        this.collect = !close && !empty && this.inCell && !this.inIs ? 1 : 0;
        break;
      case 'is':
        this.inIs = !close && !empty;
        break;
      case 'rPh':
        if (!empty) this.inPh += close ? -1 : 1;
        break;
      case 't':
        this.collect = !close && !empty && this.inIs && this.inPh === 0 ? 2 : 0;
        break;
      default:
        break;
    }
  }

  /**
   * The decoded value of attribute `name` in attribute bytes [s, e), as xml.ts's attr() gives it: attributes of the
   * plain form name="value" are walked here; anything else (non-ASCII outside a value, a stray character) goes to
   * attr() on the decoded text.
   */
  private attrText(buf: Uint8Array, s: number, e: number, name: string): string | undefined {
    const slow = (): string | undefined => attr(decoder.decode(buf.subarray(s, e)), name);
    const n0 = name.charCodeAt(0);
    const nlen = name.length;
    let i = s;
    for (;;) {
      while (i < e && isSpace(buf[i]!)) i++;
      if (i >= e) return undefined;
      const ns = i;
      let colon = -1;
      while (i < e) {
        const c = buf[i]!;
        // \w . : - (xml.ts's attribute-name pattern)
        if ((c >= 0x61 && c <= 0x7a) || (c >= 0x41 && c <= 0x5a) || (c >= 0x30 && c <= 0x39) || c === 0x5f || c === 0x2e || c === 0x2d) i++;
        else if (c === COLON) {
          if (colon < 0) colon = i;
          i++;
        } else break;
      }
      if (i === ns) return slow();
      const ne = i;
      while (i < e && isSpace(buf[i]!)) i++;
      if (buf[i] !== EQ || i >= e) return slow();
      i++;
      while (i < e && isSpace(buf[i]!)) i++;
      const q = buf[i];
      if ((q !== QUOTE && q !== APOS) || i >= e) return slow();
      const vs = ++i;
      while (i < e && buf[i] !== q) i++;
      if (i >= e) return slow();
      const ve = i++;
      const ls = colon < 0 ? ns : colon + 1;
      if (ne - ls === nlen && buf[ls] === n0 && (nlen === 1 || decodeRun(buf, ls, ne) === name)) return decodeXml(decodeRun(buf, vs, ve));
    }
  }

  /** A row tag's attributes in bytes [s, e): a plain r="digits" is read directly, anything else as text. */
  private rowBytes(buf: Uint8Array, s: number, e: number): void {
    if (this.cellAttrs(buf, s, e) && this.refS >= 0 && this.refE > this.refS && this.refE - this.refS <= 9) {
      let row = 0;
      let k = this.refS;
      for (; k < this.refE; k++) {
        const d = buf[k]! - 0x30;
        if (d < 0 || d > 9) break;
        row = row * 10 + d;
      }
      if (k === this.refE) {
        this.row = row;
        if (row < 1 || row > this.ctx.rowsMax) throw this.ctx.past(`row ${decodeRun(buf, this.refS, this.refE)}`);
        this.col = 0;
        return;
      }
    }
    this.rowTag(this.attrText(buf, s, e, 'r'));
  }

  private rowTag(r: string | undefined): void {
    const row = r === undefined ? this.row + 1 : Number(r);
    this.row = row;
    if (!Number.isInteger(row) || row < 1 || row > this.ctx.rowsMax) throw this.ctx.past(`row ${r ?? String(row)}`);
    this.col = 0;
  }

  /** Byte ranges of the r and t attributes of the c tag being read (-1 when absent), set by cellAttrs. */
  private refS = -1;
  private refE = -1;
  private typeS = -1;
  private typeE = -1;

  /**
   * Finds the r and t attributes of a c tag in bytes [s, e) when every attribute has the plain form name="value" with
   * no entity or escape in the value (what spreadsheet programs write); false when the attribute text must go the
   * slow way (attr() on the decoded text), which gives the same answer for the plain form.
   */
  private cellAttrs(buf: Uint8Array, s: number, e: number): boolean {
    this.refS = this.refE = this.typeS = this.typeE = -1;
    let i = s;
    for (;;) {
      while (i < e && isSpace(buf[i]!)) i++;
      if (i >= e) return true;
      const ns = i;
      let colon = -1;
      while (i < e) {
        const c = buf[i]!;
        if ((c >= 0x61 && c <= 0x7a) || (c >= 0x41 && c <= 0x5a) || (c >= 0x30 && c <= 0x39) || c === 0x5f || c === 0x2e || c === 0x2d) i++;
        else if (c === COLON) {
          if (colon < 0) colon = i;
          i++;
        } else break;
      }
      if (i === ns) return false;
      const ne = i;
      while (i < e && isSpace(buf[i]!)) i++;
      if (i >= e || buf[i] !== EQ) return false;
      i++;
      while (i < e && isSpace(buf[i]!)) i++;
      const q = buf[i];
      if (i >= e || (q !== QUOTE && q !== APOS)) return false;
      const vs = ++i;
      while (i < e && buf[i] !== q) {
        const c = buf[i]!;
        if (c === 0x26 /* & */ || c === 0x5f /* _ */) return false;
        i++;
      }
      if (i >= e) return false;
      const ve = i++;
      const ls = colon < 0 ? ns : colon + 1;
      if (ne - ls === 1) {
        const a = buf[ls];
        if (a === 0x72 /* r */ && this.refS < 0) {
          this.refS = vs;
          this.refE = ve;
        } else if (a === 0x74 /* t */ && this.typeS < 0) {
          this.typeS = vs;
          this.typeE = ve;
        }
      }
    }
  }

  /**
   * A c tag opened with "<c " whose attributes start at `s`, read in one walk up to its '>' when every attribute has
   * the plain form (as cellAttrs), giving the position after the tag; -1 when it must go through tag() (a '>' inside
   * a value ends the tag there for the tokeniser, so that case goes the general way too).
   */
  private fastCell(buf: Uint8Array, s: number): number {
    this.refS = this.refE = this.typeS = this.typeE = -1;
    let i = s;
    for (;;) {
      while (isSpace(buf[i]!)) i++;
      const c0 = buf[i];
      if (c0 === GT) {
        this.openCell(buf, false);
        return i + 1;
      }
      if (c0 === SLASH) {
        if (buf[i + 1] !== GT) return -1;
        this.openCell(buf, true);
        return i + 2;
      }
      const ns = i;
      let colon = -1;
      for (;;) {
        const c = buf[i]!;
        if ((c >= 0x61 && c <= 0x7a) || (c >= 0x41 && c <= 0x5a) || (c >= 0x30 && c <= 0x39) || c === 0x5f || c === 0x2e || c === 0x2d) i++;
        else if (c === COLON) {
          if (colon < 0) colon = i;
          i++;
        } else break;
      }
      if (i === ns) return -1;
      const ne = i;
      while (isSpace(buf[i]!)) i++;
      if (buf[i] !== EQ) return -1;
      i++;
      while (isSpace(buf[i]!)) i++;
      const q = buf[i];
      if (q !== QUOTE && q !== APOS) return -1;
      const vs = ++i;
      for (;;) {
        const c = buf[i]!;
        if (c === q) break;
        if (c === GT || c === 0x26 /* & */ || c === 0x5f /* _ */) return -1;
        i++;
      }
      const ve = i++;
      const ls = colon < 0 ? ns : colon + 1;
      if (ne - ls === 1) {
        const a = buf[ls];
        if (a === 0x72 /* r */ && this.refS < 0) {
          this.refS = vs;
          this.refE = ve;
        } else if (a === 0x74 /* t */ && this.typeS < 0) {
          this.typeS = vs;
          this.typeE = ve;
        }
      }
    }
  }

  /** Opens a cell whose r and t attributes cellAttrs or fastCell found. */
  private openCell(buf: Uint8Array, empty: boolean): void {
    if (this.refS < 0) this.col += 1;
    else this.cellRef(buf, this.refS, this.refE);
    this.type = this.typeS < 0 ? T_N : this.typeE - this.typeS === 1 && buf[this.typeS] === 0x73 /* s */ ? T_S : typeCode(decodeRun(buf, this.typeS, this.typeE));
    if (this.col > this.ctx.columnsMax) throw this.ctx.past(`column ${this.col} of row ${this.row}`);
    this.raw = null;
    this.runStart = -1;
    this.inIs = false;
    this.inPh = 0;
    this.collect = 0;
    this.inCell = !empty;
  }

  private cellTag(close: boolean, empty: boolean, buf: Uint8Array, s: number, e: number, attrsGiven: string | null): void {
    if (close) {
      if (this.inCell) this.finishCell();
      this.inCell = false;
      return;
    }
    let attrs = attrsGiven;
    if (attrs === null && !this.cellAttrs(buf, s, e)) attrs = decoder.decode(buf.subarray(s, e));
    if (attrs === null) return this.openCell(buf, empty);
    const r = attr(attrs, 'r');
    if (r === undefined) this.col += 1;
    else this.placeRef(r);
    this.type = typeCode(attr(attrs, 't'));
    if (this.col > this.ctx.columnsMax) throw this.ctx.past(`column ${this.col} of row ${this.row}`);
    this.raw = null;
    this.runStart = -1;
    this.inIs = false;
    this.inPh = 0;
    this.collect = 0;
    this.inCell = !empty;
  }

  /** A cell reference given as text: its row and column, or the refusal. */
  private placeRef(r: string): void {
    const at = splitRef(r);
    if (!(at.row >= 1 && at.row <= this.ctx.rowsMax && at.col >= 1 && at.col <= this.ctx.columnsMax)) throw this.ctx.past(r);
    this.row = at.row;
    this.col = at.col;
  }

  /** A cell reference in bytes [s, e): letters then digits read directly (splitRef's pattern without "$"), anything
   * else through splitRef on the text. */
  private cellRef(buf: Uint8Array, s: number, e: number): void {
    let i = s;
    let col = 0;
    while (i < e && i - s < 7) {
      const c = buf[i]! | 0x20; // lower case
      if (c < 0x61 || c > 0x7a) break;
      col = col * 26 + (c - 0x60);
      i++;
    }
    const ds = i;
    let row = 0;
    while (i < e && i - ds < 12) {
      const d = buf[i]! - 0x30;
      if (d < 0 || d > 9) break;
      row = row * 10 + d;
      i++;
    }
    if (ds === s || i === ds || i !== e) return this.placeRef(decodeRun(buf, s, e));
    if (!(row >= 1 && row <= this.ctx.rowsMax && col >= 1 && col <= this.ctx.columnsMax)) throw this.ctx.past(decodeRun(buf, s, e));
    this.row = row;
    this.col = col;
  }

  /** Stores the cell just closed, if it holds a value. */
  private finishCell(): void {
    const f = this.found;
    if (this.runStart >= 0 && this.raw === null) {
      // One run of text in the current buffer: the fast cases straight from the bytes.
      const buf = this.buf;
      const s = this.runStart;
      const e = this.runEnd;
      this.runStart = -1;
      if (this.type === T_N) {
        const v = plainDecimal(buf, s, e);
        if (v !== null) {
          f.push(this.row, this.col, KIND_NUMBER, v);
          return;
        }
      } else if (this.type === T_S) {
        let idx = 0;
        let k = s;
        for (; k < e && k - s < 9; k++) {
          const d = buf[k]! - 0x30;
          if (d < 0 || d > 9) break;
          idx = idx * 10 + d;
        }
        if (k === e && e > s) {
          const t = this.ctx.strings[idx];
          if (t !== undefined && t !== '') f.push(this.row, this.col, KIND_SHARED, idx);
          return;
        }
      } else if (this.type === T_B && e - s === 1 && (buf[s] === 0x31 || buf[s] === 0x30)) {
        f.push(this.row, this.col, buf[s] === 0x31 ? KIND_TRUE : KIND_FALSE, 0);
        return;
      }
      this.raw = decodeRun(buf, s, e);
    }
    const raw = this.raw ?? '';
    this.raw = null;
    // The rules of the grid reader, on the value's text.
    if (this.type === T_INLINE) {
      const v = decodeXml(raw);
      if (v !== '') f.pushText(this.row, this.col, v);
      return;
    }
    if (raw === '') return;
    const text = decodeXml(raw);
    switch (this.type) {
      case T_S: {
        const idx = Number(text);
        const t = this.ctx.strings[idx];
        if (t !== undefined && t !== null && t !== '') f.push(this.row, this.col, KIND_SHARED, idx);
        return;
      }
      case T_B: {
        const t = text.trim();
        f.push(this.row, this.col, t === '1' || t === 'true' ? KIND_TRUE : KIND_FALSE, 0);
        return;
      }
      case T_N: {
        const n = Number(text);
        if (text.trim() !== '' && Number.isFinite(n)) f.push(this.row, this.col, KIND_NUMBER, n);
        else f.pushText(this.row, this.col, text);
        return;
      }
      default:
        if (text !== '') f.pushText(this.row, this.col, text);
    }
  }
}

/**
 * The number written in bytes [s, e) when it is a plain decimal that converts exactly in one IEEE operation
 * (Clinger 1990): an optional sign, at most 15 digits with an optional point, an optional exponent, and a power of
 * ten up to 1e22 in all. Null for anything else (the caller then uses Number on the text). Example: "52.5" → 52.5.
 */
export function plainDecimal(buf: Uint8Array, s: number, e: number): number | null {
  let i = s;
  let neg = false;
  const c0 = buf[i];
  if (c0 === 0x2d || c0 === 0x2b) {
    neg = c0 === 0x2d;
    i++;
  }
  let m = 0;
  let digits = 0;
  let frac = 0;
  let point = false;
  for (; i < e; i++) {
    const c = buf[i]!;
    if (c >= 0x30 && c <= 0x39) {
      m = m * 10 + (c - 0x30);
      digits++;
      if (point) frac++;
    } else if (c === 0x2e && !point) point = true;
    else break;
  }
  if (digits === 0 || digits > 15) return null;
  let exp = 0;
  if (i < e) {
    const c = buf[i];
    if (c !== 0x65 && c !== 0x45) return null;
    i++;
    let eneg = false;
    if (buf[i] === 0x2d || buf[i] === 0x2b) {
      eneg = buf[i] === 0x2d;
      i++;
    }
    const es = i;
    for (; i < e && i - es < 4; i++) {
      const c2 = buf[i]!;
      if (c2 < 0x30 || c2 > 0x39) return null;
      exp = exp * 10 + (c2 - 0x30);
    }
    if (i === es || i !== e) return null;
    if (eneg) exp = -exp;
  }
  const p = exp - frac;
  if (p > 22 || p < -22) return null;
  const v = p >= 0 ? m * POW10[p]! : m / POW10[-p]!;
  return neg ? -v : v;
}

/** Column number (1-based) and row of an A1 reference; NaN parts when it is not one (xml reference ST_CellRef). */
export function splitRef(ref: string): { col: number; row: number } {
  const m = /^\$?([A-Za-z]{1,7})\$?(\d{1,12})$/.exec(ref);
  if (m === null) return { col: NaN, row: NaN };
  let col = 0;
  for (const ch of m[1]!.toUpperCase()) col = col * 26 + (ch.charCodeAt(0) - 64);
  return { col, row: Number(m[2]) };
}

/**
 * The shared-string table (ECMA-376 Part 1, §18.4: sst, si, t, r, rPh; section numbers from memory) read from its
 * bytes as it inflates, with the tokeniser's rules (xml.ts) as SheetScanner has them: each si gives the text of its
 * t elements outside rPh (phonetic runs), entities and _xHHHH_ escapes decoded; an empty <si/> gives "".
 * push() each chunk, then end(); the table is `strings`. Cost O(bytes).
 */
export class SharedStringScanner {
  readonly strings: string[] = [];
  private pending: Uint8Array = new Uint8Array(0);
  private raw = '';
  private inT = false;
  private inPh = 0;

  push(chunk: Uint8Array): void {
    let buf = chunk;
    if (this.pending.length > 0) {
      buf = new Uint8Array(this.pending.length + chunk.length);
      buf.set(this.pending);
      buf.set(chunk, this.pending.length);
    }
    let cut = buf.length;
    while (cut > 0 && buf[cut - 1] !== GT) cut--;
    this.run(buf, cut);
    let lt = cut;
    while (lt < buf.length && buf[lt] !== LT) lt++;
    let keep = lt;
    if (lt > cut) {
      const end = lt < buf.length ? lt : utf8Cut(buf, cut, buf.length);
      if (end > cut && this.inT) this.raw += decodeRun(buf, cut, end);
      keep = end;
    }
    this.pending = buf.slice(keep);
  }

  end(): void {
    const p = this.pending;
    if (p.length > 0 && p[0] !== LT && this.inT) this.raw += decodeRun(p, 0, p.length);
    this.pending = new Uint8Array(0);
  }

  private run(buf: Uint8Array, cut: number): void {
    let i = 0;
    while (i < cut) {
      if (buf[i] !== LT) {
        let j = i + 1;
        while (j < cut && buf[j] !== LT) j++;
        if (this.inT) this.raw += decodeRun(buf, i, j);
        i = j;
        continue;
      }
      let gt = i + 1;
      while (buf[gt] !== GT) gt++;
      this.tag(buf, i + 1, gt);
      i = gt + 1;
    }
  }

  /** One tag, inner bytes [s, e). */
  private tag(buf: Uint8Array, s: number, e: number): void {
    const first = buf[s];
    if (first === 0x3f /* ? */ || first === 0x21 /* ! */) return;
    const close = first === SLASH;
    const empty = !close && e > s && buf[e - 1] === SLASH;
    const p = close ? s + 1 : s;
    const end = empty ? e - 1 : e;
    let q = p;
    let colon = -1;
    let name: string | null = null;
    for (; q < end; q++) {
      const c = buf[q]!;
      if (isSpace(c)) break;
      if (c >= 0x80) {
        name = tagNameOf(decoder.decode(buf.subarray(p, end)));
        break;
      }
      if (c === COLON && colon < 0) colon = q;
    }
    if (name === null) {
      const ls = colon < 0 ? p : colon + 1;
      const len = q - ls;
      if (len > 3) return;
      name = decodeRun(buf, ls, q);
    }
    if (name === 'si') {
      if (!close) this.raw = '';
      if (close || empty) this.strings.push(decodeXml(this.raw));
    } else if (name === 'rPh') {
      if (!empty) this.inPh += close ? -1 : 1;
    } else if (name === 't') this.inT = !close && !empty && this.inPh === 0;
  }
}

/** The local name of a tag's body (name and attributes, without '<', '/' and '>'), as xml.ts splits it. */
function tagNameOf(body: string): string {
  const sp = body.search(/\s/);
  const qname = sp < 0 ? body : body.slice(0, sp);
  const colon = qname.indexOf(':');
  return colon < 0 ? qname : qname.slice(colon + 1);
}
