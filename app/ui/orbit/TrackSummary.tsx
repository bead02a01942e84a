/**
 * A target that tracks a moving direction from the orbit (scenario/orbitSchema.ts `track`): its
 * kind, the site or station it points at, the body axes and when it is due, shown in the target
 * card where a fixed target shows its attitude form. Read only in this version: edit the file's
 * `track` block (the engine validates it and its messages show below the card).
 */
import { useScenarioValue } from '../context';

type Obj = Record<string, unknown>;
const isObj = (v: unknown): v is Obj => v !== null && typeof v === 'object' && !Array.isArray(v);

const KIND: Record<string, string> = {
  site: 'Ground site',
  station: 'Ground station',
  sun: 'Sun',
  nadir: 'Nadir',
};

function axisText(v: unknown): string {
  return Array.isArray(v) && v.length === 3 ? `[${v.map((x) => String(x)).join(', ')}]` : '—';
}

function towardText(v: unknown): string {
  if (typeof v === 'string') return v;
  if (isObj(v) && Array.isArray(v.inertialDirection)) return `EME2000 ${axisText(v.inertialDirection)}`;
  return 'orbit-normal';
}

export function TrackSummary({ i }: { i: number }) {
  const track = useScenarioValue(`targets[${i}].track`);
  const win = useScenarioValue(`targets[${i}].window`);
  const sites = useScenarioValue('orbit.sites');
  if (!isObj(track)) return null;
  const kind = Object.keys(track)[0] ?? '';
  const body = track[kind];
  const b = isObj(body) ? body : {};
  const siteId = typeof b.id === 'string' ? b.id : null;
  const site = siteId && Array.isArray(sites) ? (sites as unknown[]).find((s) => isObj(s) && s.id === siteId) : undefined;
  const siteName = isObj(site) && typeof site.label === 'string' ? site.label : null;
  const rows: [string, string][] = [['Tracks', KIND[kind] ?? kind]];
  if (siteId)
    rows.push([kind === 'station' ? 'Station' : 'Site', siteName ? `${siteName} (${siteId})` : `${siteId} (not in the orbit's sites)`]);
  if (kind === 'nadir') {
    rows.push(['Yaw rule', typeof b.yaw === 'string' ? b.yaw : '—']);
    rows.push(['Body axis on nadir', b.bodyAxis ? axisText(b.bodyAxis) : '[0, 0, 1] (default)']);
  } else {
    rows.push(['Body axis', axisText(b.bodyAxis)]);
    rows.push(['Secondary axis', `${axisText(b.bodySecondary)} toward ${towardText(b.secondaryToward)}`]);
  }
  if (isObj(win))
    rows.push([
      'Due',
      win.start === 'pass-start'
        ? `at the start of the next pass${win.holdUntil === 'pass-end' ? ', held to its end' : ''}`
        : `at ${String(win.atUtc)}`,
    ]);
  else rows.push(['Due', 'after the previous target']);
  return (
    <dl className="track-summary" data-testid={`track-${i}`}>
      {rows.map(([k, v]) => (
        <div key={k}>
          <dt>{k}</dt>
          <dd>{v}</dd>
        </div>
      ))}
    </dl>
  );
}
