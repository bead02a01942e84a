/**
 * Older scenario files → the current format, before validation. Each step is explicit and
 * reported as a warning, so the user knows the file changes when it is saved again.
 *
 * Version 1 → 2:
 *  - a synergistic controller's "hysteresis" (the jump threshold on the synergy gap, in potential
 *    units) is now "gapThreshold"; "hysteresis" stays the hysteretic law's δ on h·η, a different
 *    quantity;
 *  - simulation.mode and study.mode values "profiled" / "direct" are now "follow-plan" /
 *    "step-target".
 * The input is never modified: a migrated copy is returned.
 */
import type { Issue } from '../errors';
import { issue } from '../errors';
import { SCENARIO_FORMAT, SCENARIO_VERSION } from './formatConstants';

type Obj = Record<string, unknown>;

function isObj(v: unknown): v is Obj {
  return v !== null && typeof v === 'object' && !Array.isArray(v);
}

const MODE_V2: Record<string, string> = { profiled: 'follow-plan', direct: 'step-target' };

function renameMode(o: unknown, path: string, notes: Issue[]): void {
  if (!isObj(o) || typeof o.mode !== 'string' || !(o.mode in MODE_V2)) return;
  const to = MODE_V2[o.mode]!;
  notes.push(issue(`${path}.mode`, 'migrated', `${path}.mode "${o.mode}" is called "${to}" from format version 2 on`));
  o.mode = to;
}

function v1ToV2(doc: Obj, notes: Issue[]): void {
  if (Array.isArray(doc.controllers))
    doc.controllers.forEach((c, i) => {
      if (!isObj(c) || c.law !== 'synergistic' || !('hysteresis' in c) || 'gapThreshold' in c) return;
      const { hysteresis, ...rest } = c;
      const entries = Object.entries(rest);
      // Keep the key where it was, for a tidy diff when the file is saved again.
      const at = Object.keys(c).indexOf('hysteresis');
      entries.splice(at, 0, ['gapThreshold', hysteresis]);
      for (const k of Object.keys(c)) delete c[k];
      for (const [k, v] of entries) c[k] = v;
      notes.push(
        issue(
          `controllers[${i}].gapThreshold`,
          'migrated',
          `controllers[${i}].hysteresis of a synergistic controller (its jump threshold on the synergy gap) is called "gapThreshold" from format version 2 on`,
        ),
      );
    });
  renameMode(doc.simulation, 'simulation', notes);
  renameMode(doc.study, 'study', notes);
  doc.version = 2;
}

/**
 * A copy of `json` in the current format when it is an older Slewsmith scenario; anything else
 * (not ours, newer, unreadable) comes back unchanged for the validator to name.
 */
export function migrateScenario(json: unknown): { json: unknown; notes: Issue[] } {
  if (!isObj(json) || json.format !== SCENARIO_FORMAT || json.version === SCENARIO_VERSION) return { json, notes: [] };
  if (json.version !== 1) return { json, notes: [] };
  const doc = JSON.parse(JSON.stringify(json)) as Obj;
  const notes: Issue[] = [];
  v1ToV2(doc, notes);
  notes.unshift(
    issue(
      'version',
      'migrated',
      `this file is in scenario format version 1; it is read as version ${SCENARIO_VERSION} and saving writes version ${SCENARIO_VERSION}`,
    ),
  );
  return { json: doc, notes };
}
