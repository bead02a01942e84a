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

export function parseAem(text: string): Result<AemDocument> {
  const errors: Issue[] = [];
  const err = (line: number, rule: string, message: string) =>
    errors.push({ path: `line ${line}`, rule, message: `line ${line}: ${message}` });
  if (typeof text !== 'string') return fail([{ path: '', rule: 'type', message: 'an AEM must be given as text' }]);

  const doc: AemDocument = { version: '', header: {}, comments: [], segments: [] };
  let state: State = 'start';
  let lastHeaderIdx = 0;
  let seg: AemSegment | null = null;
  let lastMetaIdx = -1;
  let segStart: AemEpoch | null = null,
    segStop: AemEpoch | null = null,
    timeSystem = '';
  let prevUseableStop: AemEpoch | null = null;
  let width: number | null = null;
  const rawLines = text.split(/\r\n|\n\r|\r|\n/);

  const closeHeader = (line: number) => {
    for (const k of AEM_HEADER_KEYS)
      if (k.mandatory && !(k.key in doc.header)) err(line, 'missing-keyword', `header keyword ${k.key} is missing before META_START`);
  };

  const closeMeta = (line: number, s: AemSegment) => {
    const md = s.metadata;
    for (const k of AEM_META_KEYS)
      if (k.mandatory && !(k.key in md))
        err(line, 'missing-keyword', `metadata keyword ${k.key} is missing (segment starting at line ${s.line})`);
    const type = md.ATTITUDE_TYPE;
    width = null;
    if (type !== undefined) {
      if (!(type in AEM_ATTITUDE_TYPES))
        err(line, 'attitude-type', `ATTITUDE_TYPE "${type}" is not one of ${Object.keys(AEM_ATTITUDE_TYPES).join(', ')}`);
      else width = AEM_ATTITUDE_TYPES[type]!;
      if (type.startsWith('EULER_ANGLE') && md.EULER_ROT_SEQ === undefined)
        err(line, 'missing-keyword', `EULER_ROT_SEQ is required with ATTITUDE_TYPE ${type}`);
    }
    if (md.INTERPOLATION_METHOD !== undefined) {
      const d = md.INTERPOLATION_DEGREE;
      if (d === undefined) err(line, 'missing-keyword', 'INTERPOLATION_DEGREE is required when INTERPOLATION_METHOD is given');
      else if (!/^\d+$/.test(d) || Number(d) < 1)
        err(line, 'interpolation-degree', `INTERPOLATION_DEGREE must be a positive whole number (got "${d}")`);
    }
    timeSystem = md.TIME_SYSTEM ?? '';
    const t: Partial<Record<string, AemEpoch>> = {};
    for (const k of EPOCH_KEYS) {
      if (md[k] === undefined) continue;
      const e = parseAemEpoch(md[k], timeSystem === 'UTC');
      if (!e) err(line, 'epoch', `${k} "${md[k]}" is not an epoch of the form YYYY-MM-DDThh:mm:ss[.d…d][Z] or YYYY-DDDThh:mm:ss[.d…d][Z]`);
      else t[k] = e;
    }
    segStart = t.START_TIME ?? null;
    segStop = t.STOP_TIME ?? null;
    const order = ['START_TIME', 'USEABLE_START_TIME', 'USEABLE_STOP_TIME', 'STOP_TIME'].filter((k) => t[k]);
    for (let i = 1; i < order.length; i++) {
      if (compareEpochs(t[order[i - 1]!]!, t[order[i]!]!) > 0) err(line, 'time-range', `${order[i - 1]} is after ${order[i]}`);
    }
    const useStart = t.USEABLE_START_TIME ?? t.START_TIME;
    if (prevUseableStop && useStart && compareEpochs(useStart, prevUseableStop) < 0) {
      err(
        line,
        'useable',
        "this segment's USEABLE_START_TIME (or START_TIME) is before the previous segment's USEABLE_STOP_TIME (or STOP_TIME)",
      );
    }
    prevUseableStop = t.USEABLE_STOP_TIME ?? t.STOP_TIME ?? prevUseableStop;
  };

  for (let i = 0; i < rawLines.length; i++) {
    const ln = i + 1;
    const raw = rawLines[i]!;
    if (raw.length > KVN_MAX_LINE) err(ln, 'line-length', `${raw.length} characters; KVN lines hold at most ${KVN_MAX_LINE}`);
    if (!isPrintableAscii(raw)) err(ln, 'ascii', 'contains a character outside printable ASCII (tabs included)');
    const s = raw.trim();
    if (s === '') continue;

    const isComment = /^COMMENT(\s|$)/.test(s);
    const comment = isComment ? s.slice(7).trim() : '';
    const kvm = /^([A-Za-z0-9_]+)\s*=\s*(.*?)\s*$/.exec(s);
    const bare = s; // META_START and friends have no "="

    if (state === 'start') {
      if (!kvm || kvm[1] !== 'CCSDS_AEM_VERS') {
        err(ln, 'first-line', 'the first non-blank line of an AEM must be "CCSDS_AEM_VERS = 2.0"');
        return fail(errors);
      }
      doc.version = kvm[2]!;
      doc.header.CCSDS_AEM_VERS = kvm[2]!;
      if (kvm[2] !== AEM_VERSION) err(ln, 'version', `CCSDS_AEM_VERS = ${kvm[2]}: this reader reads version ${AEM_VERSION} only`);
      state = 'header';
      continue;
    }

    if (state === 'header') {
      if (isComment) {
        if (lastHeaderIdx > 0) err(ln, 'comment-placement', 'header comments belong directly after CCSDS_AEM_VERS');
        else doc.comments.push(comment);
        continue;
      }
      if (bare === 'META_START') {
        closeHeader(ln);
        state = 'meta';
        seg = { line: ln, metadata: {}, comments: [], dataComments: [], lines: [] };
        lastMetaIdx = -1;
        continue;
      }
      if (!kvm) {
        err(ln, 'syntax', `expected "KEYWORD = value" in the header (got "${s.slice(0, 40)}")`);
        continue;
      }
      const key = kvm[1]!,
        value = kvm[2]!;
      if (key !== key.toUpperCase()) {
        err(ln, 'key-case', `keyword "${key}" must be upper case`);
        continue;
      }
      const idx = HEADER_INDEX.get(key);
      if (idx === undefined) {
        err(ln, 'unknown-keyword', `${key} is not an AEM header keyword`);
        continue;
      }
      if (key in doc.header) {
        err(ln, 'duplicate', `${key} appears twice`);
        continue;
      }
      if (idx < lastHeaderIdx) err(ln, 'keyword-order', `${key} must come before ${AEM_HEADER_KEYS[lastHeaderIdx]!.key}`);
      lastHeaderIdx = Math.max(lastHeaderIdx, idx);
      if (value === '') err(ln, 'empty-value', `${key} has no value`);
      if (key === 'CREATION_DATE' && !parseAemEpoch(value, true)) err(ln, 'epoch', `CREATION_DATE "${value}" is not an epoch`);
      doc.header[key] = value;
      continue;
    }

    if (state === 'between') {
      if (bare === 'META_START') {
        state = 'meta';
        seg = { line: ln, metadata: {}, comments: [], dataComments: [], lines: [] };
        lastMetaIdx = -1;
      } else if (isComment) err(ln, 'comment-placement', 'comments may not follow DATA_STOP; put them after META_START or DATA_START');
      else err(ln, 'structure', `expected META_START (got "${s.slice(0, 40)}")`);
      continue;
    }

    if (state === 'meta' && seg) {
      if (isComment) {
        if (lastMetaIdx >= 0) err(ln, 'comment-placement', 'metadata comments belong directly after META_START');
        else seg.comments.push(comment);
        continue;
      }
      if (bare === 'META_STOP') {
        closeMeta(ln, seg);
        state = 'after-meta';
        continue;
      }
      if (bare === 'DATA_START' || bare === 'META_START') {
        err(ln, 'structure', `${bare} before META_STOP`);
        continue;
      }
      if (!kvm) {
        err(ln, 'syntax', `expected "KEYWORD = value" in the metadata (got "${s.slice(0, 40)}")`);
        continue;
      }
      const key = kvm[1]!,
        value = kvm[2]!;
      if (key !== key.toUpperCase()) {
        err(ln, 'key-case', `keyword "${key}" must be upper case`);
        continue;
      }
      const idx = META_INDEX.get(key);
      if (idx === undefined) {
        err(ln, 'unknown-keyword', `${key} is not an AEM metadata keyword`);
        continue;
      }
      if (key in seg.metadata) {
        err(ln, 'duplicate', `${key} appears twice in this metadata block`);
        continue;
      }
      if (idx < lastMetaIdx)
        err(ln, 'keyword-order', `${key} must come before ${AEM_META_KEYS[lastMetaIdx]!.key} (CCSDS 504.0-B-2 Table 4-3 order)`);
      lastMetaIdx = Math.max(lastMetaIdx, idx);
      if (value === '') err(ln, 'empty-value', `${key} has no value`);
      if (!EPOCH_KEYS.has(key) && /[a-z]/.test(value) && /[A-Z]/.test(value))
        err(ln, 'text-case', `${key} value "${value}" mixes upper and lower case`);
      seg.metadata[key] = value;
      continue;
    }

    if (state === 'after-meta') {
      if (bare === 'DATA_START') state = 'data';
      else if (isComment) err(ln, 'comment-placement', 'comments may not sit between META_STOP and DATA_START');
      else err(ln, 'structure', `expected DATA_START (got "${s.slice(0, 40)}")`);
      continue;
    }

    if (state === 'data' && seg) {
      if (isComment) {
        if (seg.lines.length > 0)
          err(ln, 'comment-placement', 'comments may not sit between data lines; put them directly after DATA_START');
        else seg.dataComments.push(comment);
        continue;
      }
      if (bare === 'DATA_STOP') {
        if (seg.lines.length === 0) err(ln, 'empty-data', 'a data block needs at least one data line');
        doc.segments.push(seg);
        seg = null;
        state = 'between';
        continue;
      }
      if (kvm || bare === 'META_START' || bare === 'DATA_START' || bare === 'META_STOP') {
        err(ln, 'structure', `"${s.slice(0, 40)}" inside a data block (missing DATA_STOP?)`);
        continue;
      }
      const tok = s.split(/\s+/);
      const time = parseAemEpoch(tok[0]!, timeSystem === 'UTC');
      if (!time) {
        err(ln, 'epoch', `"${tok[0]}" is not an epoch of the form YYYY-MM-DDThh:mm:ss[.d…d][Z]`);
        continue;
      }
      const values: number[] = [];
      let bad = false;
      for (let k = 1; k < tok.length; k++) {
        const r = parseKvnNumber(tok[k]!);
        if ('reason' in r) {
          err(ln, 'number', `value ${k}: ${r.reason}`);
          bad = true;
        } else values.push(r.value);
      }
      if (bad) continue;
      if (width !== null && values.length !== width) {
        err(ln, 'columns', `${values.length} values after the epoch; ATTITUDE_TYPE ${seg.metadata.ATTITUDE_TYPE} has ${width}`);
        continue;
      }
      const prev = seg.lines[seg.lines.length - 1];
      if (prev && compareEpochs(time, prev.time) <= 0)
        err(ln, 'time-order', `epoch ${tok[0]} does not increase from ${prev.epoch} (line ${prev.line})`);
      if ((segStart && compareEpochs(time, segStart) < 0) || (segStop && compareEpochs(time, segStop) > 0)) {
        err(ln, 'time-range', `epoch ${tok[0]} lies outside START_TIME…STOP_TIME of its segment`);
      }
      seg.lines.push({ line: ln, epoch: tok[0]!, time, values });
      continue;
    }
  }

  const endLine = rawLines.length;
  if (state === 'start') err(endLine, 'first-line', 'the text is empty; an AEM starts with "CCSDS_AEM_VERS = 2.0"');
  else if (state === 'header') {
    closeHeader(endLine);
    err(endLine, 'eof', 'the file ends before the first META_START; an AEM needs at least one segment');
  } else if (state !== 'between')
    err(
      endLine,
      'eof',
      `the file ends inside a ${state === 'data' ? 'data' : 'metadata'} block (missing ${state === 'data' ? 'DATA_STOP' : state === 'meta' ? 'META_STOP' : 'DATA_START'})`,
    );

  return errors.length ? fail(errors) : ok(doc);
}
