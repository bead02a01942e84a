/**
 * Reading a study summary.json back (the app's "Open results": a campaign merged on a cluster, or
 * a study run from the CLI). The file's own contents become the study view's state: the study
 * info (definition and controllers), the per-controller summary and the outcome map; its
 * `scenario` (the scenario as run) lets a worst case be re-flown as a normal run. Every check
 * names the field as the file spells it; nothing here trusts the file's shape.
 */
import type { Issue, Result } from '../errors';
import { fail, ok } from '../errors';
import { SUMMARY_FORMAT, SUMMARY_VERSION } from './export';
import { QUANTITIES } from './quantities';
import type { MapPoint, StudyInfo, StudySummary } from './summary';

type Obj = Record<string, unknown>;
const isObj = (v: unknown): v is Obj => typeof v === 'object' && v !== null && !Array.isArray(v);
const isCount = (v: unknown): v is number => typeof v === 'number' && Number.isSafeInteger(v) && v >= 0;
const isNum = (v: unknown): v is number => typeof v === 'number' && Number.isFinite(v);
const isNumOrNull = (v: unknown) => v === null || isNum(v);

const SHARE_KEYS = ['settled', 'notSettled', 'unwound', 'longWay', 'chattered'] as const;
const COUNT_KEYS = ['cases', 'flyable', 'settled', 'unsettled', 'failed', 'unwound', 'longWay', 'chattered'] as const;

function controllerIssues(c: unknown, at: string): Issue[] {
  const out: Issue[] = [];
  const bad = (p: string, rule: string, message: string) => out.push({ path: `${at}.${p}`, rule, message: `${at}.${p} ${message}` });
  if (!isObj(c)) return [{ path: at, rule: 'object', message: `${at} must be an object` }];
  for (const k of ['controllerId', 'label', 'law']) if (typeof c[k] !== 'string') bad(k, 'string', 'must be text');
  for (const k of COUNT_KEYS) if (!isCount(c[k])) bad(k, 'count', 'must be a whole number ≥ 0');
  const shares = isObj(c.shares) ? c.shares : null;
  if (!shares) bad('shares', 'object', 'must hold the shares with their intervals');
  else
    for (const k of SHARE_KEYS) {
      const s = shares[k];
      if (
        !isObj(s) ||
        !isCount(s.count) ||
        !isCount(s.of) ||
        !isNum(s.share) ||
        !isNum(s.low) ||
        !isNum(s.high) ||
        !isNumOrNull(s.ruleOfThreeHigh)
      )
        bad(`shares.${k}`, 'share', 'must be {count, of, share, low, high, ruleOfThreeHigh}');
    }
  const spreads = isObj(c.spreads) ? c.spreads : {};
  const hist = isObj(c.histograms) ? c.histograms : {};
  for (const q of QUANTITIES) {
    const s = spreads[q.key];
    if (!isObj(s) || !isCount(s.n) || !['mean', 'sd', 'min', 'max', 'median', 'p95'].every((k) => isNumOrNull(s[k])))
      bad(`spreads.${q.key}`, 'spread', 'must be {n, mean, sd, min, max, median, p95, …}');
    const h = hist[q.key];
    const okH =
      isObj(h) &&
      Array.isArray(h.edges) &&
      h.edges.length >= 2 &&
      h.edges.every(isNum) &&
      Array.isArray(h.counts) &&
      h.counts.length === h.edges.length - 1 &&
      h.counts.every(isCount) &&
      isCount(h.overflow) &&
      isCount(h.underflow);
    if (!okH) bad(`histograms.${q.key}`, 'histogram', 'must be {edges, counts (one fewer), overflow, underflow}');
  }
  if (
    !Array.isArray(c.worst) ||
    !c.worst.every((w) => isObj(w) && isCount(w.index) && typeof w.status === 'string' && isNum(w.finalErrorDeg))
  )
    bad('worst', 'worst-cases', 'must be a list of {index, status, settleTimeS, finalErrorDeg, …}');
  return out;
}

function mapIssues(map: unknown, controllers: number): Issue[] {
  if (!Array.isArray(map)) return [{ path: 'map', rule: 'array', message: 'map must be a list of points' }];
  for (let i = 0; i < map.length; i++) {
    const p = map[i] as unknown;
    const okP =
      isObj(p) &&
      isCount(p.index) &&
      Array.isArray(p.axis) &&
      p.axis.length === 3 &&
      p.axis.every(isNum) &&
      isNum(p.angleDeg) &&
      isNum(p.eta0) &&
      Array.isArray(p.outcome) &&
      p.outcome.length === controllers &&
      p.outcome.every((o) => typeof o === 'string') &&
      Array.isArray(p.settleTimeS) &&
      p.settleTimeS.length === controllers &&
      p.settleTimeS.every(isNumOrNull);
    if (!okP)
      return [
        {
          path: `map[${i}]`,
          rule: 'map-point',
          message: `map[${i}] must be {index, axis[3], angleDeg, eta0, outcome[${controllers}], settleTimeS[${controllers}]}`,
        },
      ];
  }
  return [];
}

export interface LoadedStudy {
  info: StudyInfo;
  summary: StudySummary;
  map: MapPoint[];
  /** The scenario as run, when the file carries it (re-flying a case needs it). */
  scenario: unknown;
}

/** A parsed summary.json (format version 2) as the study view's state. */
export function readStudySummary(v: unknown): Result<LoadedStudy> {
  if (!isObj(v) || v.format !== SUMMARY_FORMAT)
    return fail([
      { path: 'format', rule: 'format', message: `this is not a Slewsmith study summary (its "format" is not "${SUMMARY_FORMAT}")` },
    ]);
  if (v.version !== SUMMARY_VERSION)
    return fail([
      {
        path: 'version',
        rule: 'version',
        message: `summary version ${String(v.version)} cannot be opened; this Slewsmith opens version ${SUMMARY_VERSION} (run the study or the merge again)`,
      },
    ]);
  const issues: Issue[] = [];
  const study = v.study;
  if (!isObj(study) || !isCount(study.runs) || !isCount(study.seed) || !isNum(study.durationS))
    issues.push({ path: 'study', rule: 'object', message: 'study must be the study definition {runs, seed, durationS, …}' });
  const s = v.summary;
  if (
    !isObj(s) ||
    typeof s.scenarioName !== 'string' ||
    !isCount(s.casesDone) ||
    !Array.isArray(s.controllers) ||
    s.controllers.length === 0
  )
    return fail([
      ...issues,
      { path: 'summary', rule: 'object', message: 'summary must hold scenarioName, casesDone and at least one controller' },
    ]);
  (s.controllers as unknown[]).forEach((c, i) => issues.push(...controllerIssues(c, `summary.controllers[${i}]`)));
  issues.push(...mapIssues(v.map, s.controllers.length));
  if (issues.length) return fail(issues);
  const summary = s as unknown as StudySummary;
  const info: StudyInfo = {
    scenarioName: summary.scenarioName,
    scenario: v.scenario ?? undefined,
    def: study as unknown as StudyInfo['def'],
    controllers: summary.controllers.map((c) => ({ id: c.controllerId, label: c.label, law: c.law })),
  };
  return ok({ info, summary, map: v.map as MapPoint[], scenario: v.scenario ?? null });
}
