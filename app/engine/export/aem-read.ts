/**
 * Reader for CCSDS AEM version 2 in KVN form (CCSDS 504.0-B-2): header, then segments of
 * META_START…META_STOP and DATA_START…DATA_STOP. It checks what a writer must respect — keyword
 * order (§6.7.8, Tables 4-2 and 4-3), mandatory keywords, comment placement, printable ASCII and
 * the 254-character limit, epoch syntax (§6.8.9), number syntax (≤ 16 significant digits, no −0),
 * data-line width per ATTITUDE_TYPE, strictly increasing epochs within [START_TIME, STOP_TIME],
 * and USEABLE times that do not go back from one segment to the next — and reports every problem
 * with its line number (path `line N`).
 */
import type { Issue, Result } from '../errors';
import { fail, ok } from '../errors';
import { AEM_ATTITUDE_TYPES, AEM_HEADER_KEYS, AEM_META_KEYS, AEM_VERSION, KVN_MAX_LINE } from './aem-keywords';
import type { AemEpoch } from './kvn';
import { compareEpochs, isPrintableAscii, parseAemEpoch, parseKvnNumber } from './kvn';

export interface AemDataLine {
  line: number;
  epoch: string;
  time: AemEpoch;
  values: number[];
}

export interface AemSegment {
  /** Line of META_START. */
  line: number;
  metadata: Record<string, string>;
  comments: string[];
  dataComments: string[];
  lines: AemDataLine[];
}

export interface AemDocument {
  version: string;
  header: Record<string, string>;
  comments: string[];
  segments: AemSegment[];
}

type State = 'start' | 'header' | 'between' | 'meta' | 'after-meta' | 'data';

const HEADER_INDEX = new Map<string, number>(AEM_HEADER_KEYS.map((k, i) => [k.key, i]));
const META_INDEX = new Map<string, number>(AEM_META_KEYS.map((k, i) => [k.key, i]));
const EPOCH_KEYS = new Set(['START_TIME', 'USEABLE_START_TIME', 'USEABLE_STOP_TIME', 'STOP_TIME']);

/** A keyword block (header or metadata): its keyword table and how its messages name it. */
interface KeywordBlock {
  where: string;
  index: Map<string, number>;
  keys: readonly { key: string }[];
  unknown: string;
  twice: string;
  orderNote: string;
}

const HEADER_BLOCK: KeywordBlock = {
  where: 'the header',
  index: HEADER_INDEX,
  keys: AEM_HEADER_KEYS,
  unknown: 'is not an AEM header keyword',
  twice: 'appears twice',
  orderNote: '',
};
const META_BLOCK: KeywordBlock = {
  where: 'the metadata',
  index: META_INDEX,
  keys: AEM_META_KEYS,
  unknown: 'is not an AEM metadata keyword',
  twice: 'appears twice in this metadata block',
  orderNote: ' (CCSDS 504.0-B-2 Table 4-3 order)',
};

/** One non-blank line, trimmed and classified once. */
interface KvnLine {
  ln: number;
  s: string;
  isComment: boolean;
  /** The comment's text (COMMENT lines). */
  comment: string;
  /** `KEYWORD = value` split, or null. */
  kvm: RegExpExecArray | null;
}

export function parseAem(text: string): Result<AemDocument> {
  if (typeof text !== 'string') return fail([{ path: '', rule: 'type', message: 'an AEM must be given as text' }]);
  const reader = new AemReader();
  const rawLines = text.split(/\r\n|\n\r|\r|\n/);
  for (let i = 0; i < rawLines.length; i++) {
    if (!reader.line(i + 1, rawLines[i]!)) return fail(reader.errors);
  }
  reader.end(rawLines.length);
  return reader.errors.length ? fail(reader.errors) : ok(reader.doc);
}

/**
 * The same checks as parseAem, line by line, for text that is never held whole (the AEM writer's
 * read-back of a streamed export): data lines are checked but not kept, so memory stays flat.
 */
export class AemLineChecker {
  private readonly reader = new AemReader(false);
  private count = 0;
  private stopped = false;

  /** Checks the next line (without its line ending). */
  line(raw: string): void {
    if (!this.stopped && !this.reader.line(++this.count, raw)) this.stopped = true;
  }

  /** Every problem found, after the end-of-file checks (`lines` as parseAem counts them: a final line ending adds one). */
  end(finalLineEnding = true): Issue[] {
    if (!this.stopped) this.reader.end(this.count + (finalLineEnding ? 1 : 0));
    return this.reader.errors;
  }
}

/** The reader's state between lines: where it is, the segment being read, and what order and times to hold it to. */
class AemReader {
  readonly errors: Issue[] = [];
  readonly doc: AemDocument = { version: '', header: {}, comments: [], segments: [] };
  private state: State = 'start';
  private lastHeaderIdx = 0;
  private seg: AemSegment | null = null;
  private lastMetaIdx = -1;
  private segStart: AemEpoch | null = null;
  private segStop: AemEpoch | null = null;
  private timeSystem = '';
  private prevUseableStop: AemEpoch | null = null;
  /** Values per data line of the segment's ATTITUDE_TYPE (null when unknown). */
  private width: number | null = null;
  /** The segment's last data line and how many it has (kept even when the lines themselves are not). */
  private prevLine: AemDataLine | null = null;
  private lineCount = 0;

  /** `keepLines`: store every data line in the document (parseAem); false only checks them. */
  constructor(private readonly keepLines = true) {}

  private err(line: number, rule: string, message: string): void {
    this.errors.push({ path: `line ${line}`, rule, message: `line ${line}: ${message}` });
  }

  /** Read one line; false when reading cannot go on (the first line is not the version line). */
  line(ln: number, raw: string): boolean {
    if (raw.length > KVN_MAX_LINE) this.err(ln, 'line-length', `${raw.length} characters; KVN lines hold at most ${KVN_MAX_LINE}`);
    if (!isPrintableAscii(raw)) this.err(ln, 'ascii', 'contains a character outside printable ASCII (tabs included)');
    const s = raw.trim();
    if (s === '') return true;
    const isComment = /^COMMENT(\s|$)/.test(s);
    const l: KvnLine = { ln, s, isComment, comment: isComment ? s.slice(7).trim() : '', kvm: /^([A-Za-z0-9_]+)\s*=\s*(.*?)\s*$/.exec(s) };
    if (this.state === 'start') return this.versionLine(l);
    if (this.state === 'header') this.headerLine(l);
    else if (this.state === 'between') this.betweenLine(l);
    else if (this.state === 'meta' && this.seg) this.metaLine(l, this.seg);
    else if (this.state === 'after-meta') this.afterMetaLine(l);
    else if (this.state === 'data' && this.seg) this.dataLine(l, this.seg);
    return true;
  }

  /** What an unfinished file lacks, at its last line. */
  end(endLine: number): void {
    const state = this.state;
    if (state === 'start') this.err(endLine, 'first-line', 'the text is empty; an AEM starts with "CCSDS_AEM_VERS = 2.0"');
    else if (state === 'header') {
      this.closeHeader(endLine);
      this.err(endLine, 'eof', 'the file ends before the first META_START; an AEM needs at least one segment');
    } else if (state !== 'between')
      this.err(
        endLine,
        'eof',
        `the file ends inside a ${state === 'data' ? 'data' : 'metadata'} block (missing ${state === 'data' ? 'DATA_STOP' : state === 'meta' ? 'META_STOP' : 'DATA_START'})`,
      );
  }

  // ---- header

  private versionLine({ ln, kvm }: KvnLine): boolean {
    if (!kvm || kvm[1] !== 'CCSDS_AEM_VERS') {
      this.err(ln, 'first-line', 'the first non-blank line of an AEM must be "CCSDS_AEM_VERS = 2.0"');
      return false;
    }
    this.doc.version = kvm[2]!;
    this.doc.header.CCSDS_AEM_VERS = kvm[2]!;
    if (kvm[2] !== AEM_VERSION) this.err(ln, 'version', `CCSDS_AEM_VERS = ${kvm[2]}: this reader reads version ${AEM_VERSION} only`);
    this.state = 'header';
    return true;
  }

  private headerLine(l: KvnLine): void {
    if (l.isComment) {
      if (this.lastHeaderIdx > 0) this.err(l.ln, 'comment-placement', 'header comments belong directly after CCSDS_AEM_VERS');
      else this.doc.comments.push(l.comment);
      return;
    }
    if (l.s === 'META_START') {
      this.closeHeader(l.ln);
      this.openSegment(l.ln);
      return;
    }
    const idx = this.keywordIndex(l, HEADER_BLOCK, this.doc.header, this.lastHeaderIdx);
    if (idx < 0) return;
    const key = l.kvm![1]!,
      value = l.kvm![2]!;
    this.lastHeaderIdx = Math.max(this.lastHeaderIdx, idx);
    if (key === 'CREATION_DATE' && !parseAemEpoch(value, true)) this.err(l.ln, 'epoch', `CREATION_DATE "${value}" is not an epoch`);
    this.doc.header[key] = value;
  }

  private closeHeader(line: number): void {
    for (const k of AEM_HEADER_KEYS)
      if (k.mandatory && !(k.key in this.doc.header))
        this.err(line, 'missing-keyword', `header keyword ${k.key} is missing before META_START`);
  }

  /**
   * The checks a header and a metadata keyword line share: "KEYWORD = value" syntax, upper case, a
   * keyword of the block, given once, in the standard's order (after the one at `last`), with a
   * value. The keyword's index in its table, or −1 when the line is refused.
   */
  private keywordIndex(l: KvnLine, block: KeywordBlock, values: Record<string, string>, last: number): number {
    const { ln, kvm } = l;
    if (!kvm) {
      this.err(ln, 'syntax', `expected "KEYWORD = value" in ${block.where} (got "${l.s.slice(0, 40)}")`);
      return -1;
    }
    const key = kvm[1]!,
      value = kvm[2]!;
    if (key !== key.toUpperCase()) {
      this.err(ln, 'key-case', `keyword "${key}" must be upper case`);
      return -1;
    }
    const idx = block.index.get(key);
    if (idx === undefined) {
      this.err(ln, 'unknown-keyword', `${key} ${block.unknown}`);
      return -1;
    }
    if (key in values) {
      this.err(ln, 'duplicate', `${key} ${block.twice}`);
      return -1;
    }
    if (idx < last) this.err(ln, 'keyword-order', `${key} must come before ${block.keys[last]!.key}${block.orderNote}`);
    if (value === '') this.err(ln, 'empty-value', `${key} has no value`);
    return idx;
  }

  // ---- segments: metadata

  private openSegment(ln: number): void {
    this.state = 'meta';
    this.seg = { line: ln, metadata: {}, comments: [], dataComments: [], lines: [] };
    this.lastMetaIdx = -1;
    this.prevLine = null;
    this.lineCount = 0;
  }

  private betweenLine(l: KvnLine): void {
    if (l.s === 'META_START') this.openSegment(l.ln);
    else if (l.isComment) this.err(l.ln, 'comment-placement', 'comments may not follow DATA_STOP; put them after META_START or DATA_START');
    else this.err(l.ln, 'structure', `expected META_START (got "${l.s.slice(0, 40)}")`);
  }

  private metaLine(l: KvnLine, seg: AemSegment): void {
    if (l.isComment) {
      if (this.lastMetaIdx >= 0) this.err(l.ln, 'comment-placement', 'metadata comments belong directly after META_START');
      else seg.comments.push(l.comment);
      return;
    }
    if (l.s === 'META_STOP') {
      this.closeMeta(l.ln, seg);
      this.state = 'after-meta';
      return;
    }
    if (l.s === 'DATA_START' || l.s === 'META_START') {
      this.err(l.ln, 'structure', `${l.s} before META_STOP`);
      return;
    }
    const idx = this.keywordIndex(l, META_BLOCK, seg.metadata, this.lastMetaIdx);
    if (idx < 0) return;
    const key = l.kvm![1]!,
      value = l.kvm![2]!;
    this.lastMetaIdx = Math.max(this.lastMetaIdx, idx);
    if (!EPOCH_KEYS.has(key) && /[a-z]/.test(value) && /[A-Z]/.test(value))
      this.err(l.ln, 'text-case', `${key} value "${value}" mixes upper and lower case`);
    seg.metadata[key] = value;
  }

  /** At META_STOP: mandatory keywords, the attitude type's data width, interpolation, the segment's times. */
  private closeMeta(line: number, s: AemSegment): void {
    const md = s.metadata;
    for (const k of AEM_META_KEYS)
      if (k.mandatory && !(k.key in md))
        this.err(line, 'missing-keyword', `metadata keyword ${k.key} is missing (segment starting at line ${s.line})`);
    const type = md.ATTITUDE_TYPE;
    this.width = null;
    if (type !== undefined) {
      if (!(type in AEM_ATTITUDE_TYPES))
        this.err(line, 'attitude-type', `ATTITUDE_TYPE "${type}" is not one of ${Object.keys(AEM_ATTITUDE_TYPES).join(', ')}`);
      else this.width = AEM_ATTITUDE_TYPES[type]!;
      if (type.startsWith('EULER_ANGLE') && md.EULER_ROT_SEQ === undefined)
        this.err(line, 'missing-keyword', `EULER_ROT_SEQ is required with ATTITUDE_TYPE ${type}`);
    }
    if (md.INTERPOLATION_METHOD !== undefined) {
      const d = md.INTERPOLATION_DEGREE;
      if (d === undefined) this.err(line, 'missing-keyword', 'INTERPOLATION_DEGREE is required when INTERPOLATION_METHOD is given');
      else if (!/^\d+$/.test(d) || Number(d) < 1)
        this.err(line, 'interpolation-degree', `INTERPOLATION_DEGREE must be a positive whole number (got "${d}")`);
    }
    this.closeMetaTimes(line, md);
  }

  /** The segment's epochs: their syntax, their order, and USEABLE times that do not go back from the previous segment. */
  private closeMetaTimes(line: number, md: Record<string, string>): void {
    this.timeSystem = md.TIME_SYSTEM ?? '';
    const t: Partial<Record<string, AemEpoch>> = {};
    for (const k of EPOCH_KEYS) {
      if (md[k] === undefined) continue;
      const e = parseAemEpoch(md[k], this.timeSystem === 'UTC');
      if (!e)
        this.err(line, 'epoch', `${k} "${md[k]}" is not an epoch of the form YYYY-MM-DDThh:mm:ss[.d…d][Z] or YYYY-DDDThh:mm:ss[.d…d][Z]`);
      else t[k] = e;
    }
    this.segStart = t.START_TIME ?? null;
    this.segStop = t.STOP_TIME ?? null;
    const order = ['START_TIME', 'USEABLE_START_TIME', 'USEABLE_STOP_TIME', 'STOP_TIME'].filter((k) => t[k]);
    for (let i = 1; i < order.length; i++) {
      if (compareEpochs(t[order[i - 1]!]!, t[order[i]!]!) > 0) this.err(line, 'time-range', `${order[i - 1]} is after ${order[i]}`);
    }
    const useStart = t.USEABLE_START_TIME ?? t.START_TIME;
    if (this.prevUseableStop && useStart && compareEpochs(useStart, this.prevUseableStop) < 0) {
      this.err(
        line,
        'useable',
        "this segment's USEABLE_START_TIME (or START_TIME) is before the previous segment's USEABLE_STOP_TIME (or STOP_TIME)",
      );
    }
    this.prevUseableStop = t.USEABLE_STOP_TIME ?? t.STOP_TIME ?? this.prevUseableStop;
  }

  // ---- segments: data

  private afterMetaLine(l: KvnLine): void {
    if (l.s === 'DATA_START') this.state = 'data';
    else if (l.isComment) this.err(l.ln, 'comment-placement', 'comments may not sit between META_STOP and DATA_START');
    else this.err(l.ln, 'structure', `expected DATA_START (got "${l.s.slice(0, 40)}")`);
  }

  private dataLine(l: KvnLine, seg: AemSegment): void {
    const { ln, s } = l;
    if (l.isComment) {
      if (this.lineCount > 0)
        this.err(ln, 'comment-placement', 'comments may not sit between data lines; put them directly after DATA_START');
      else seg.dataComments.push(l.comment);
      return;
    }
    if (s === 'DATA_STOP') {
      if (this.lineCount === 0) this.err(ln, 'empty-data', 'a data block needs at least one data line');
      this.doc.segments.push(seg);
      this.seg = null;
      this.state = 'between';
      return;
    }
    if (l.kvm || s === 'META_START' || s === 'DATA_START' || s === 'META_STOP') {
      this.err(ln, 'structure', `"${s.slice(0, 40)}" inside a data block (missing DATA_STOP?)`);
      return;
    }
    const tok = s.split(/\s+/);
    const time = parseAemEpoch(tok[0]!, this.timeSystem === 'UTC');
    if (!time) {
      this.err(ln, 'epoch', `"${tok[0]}" is not an epoch of the form YYYY-MM-DDThh:mm:ss[.d…d][Z]`);
      return;
    }
    const values = this.dataValues(ln, tok);
    if (values === null) return;
    if (this.width !== null && values.length !== this.width) {
      this.err(ln, 'columns', `${values.length} values after the epoch; ATTITUDE_TYPE ${seg.metadata.ATTITUDE_TYPE} has ${this.width}`);
      return;
    }
    const prev = this.prevLine;
    if (prev && compareEpochs(time, prev.time) <= 0)
      this.err(ln, 'time-order', `epoch ${tok[0]} does not increase from ${prev.epoch} (line ${prev.line})`);
    if ((this.segStart && compareEpochs(time, this.segStart) < 0) || (this.segStop && compareEpochs(time, this.segStop) > 0)) {
      this.err(ln, 'time-range', `epoch ${tok[0]} lies outside START_TIME…STOP_TIME of its segment`);
    }
    const entry = { line: ln, epoch: tok[0]!, time, values };
    this.prevLine = entry;
    this.lineCount++;
    if (this.keepLines) seg.lines.push(entry);
  }

  /** The numbers after the epoch, or null when any is not a KVN number (each one reported). */
  private dataValues(ln: number, tok: string[]): number[] | null {
    const values: number[] = [];
    let bad = false;
    for (let k = 1; k < tok.length; k++) {
      const r = parseKvnNumber(tok[k]!);
      if ('reason' in r) {
        this.err(ln, 'number', `value ${k}: ${r.reason}`);
        bad = true;
      } else values.push(r.value);
    }
    return bad ? null : values;
  }
}
