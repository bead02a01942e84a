/**
 * The target card's first choice: a fixed attitude (the attitude forms) or one of the orbit's
 * moving targets (trackForms.ts). Offered when the scenario has an orbit block, or when the
 * target already tracks (so a track left without an orbit can be turned back).
 */
import { useApp, useAppState, useScenarioValue } from '../context';
import { SelectField } from '../components/fields';
import { retargetKind, TARGET_KINDS, targetKindOf, type TargetKind } from './trackForms';

export function TargetKindChoice({ i }: { i: number }) {
  const app = useApp();
  const target = useScenarioValue(`targets[${i}]`);
  const hasOrbit = useScenarioValue('orbit') !== undefined;
  const kind = targetKindOf(target);
  const trackedQ = useAppState((s) => s.output?.scenario.targets[i]?.q ?? null);
  if (!hasOrbit && kind === 'fixed') return null;
  return (
    <SelectField
      label="Target"
      value={kind}
      choices={hasOrbit ? TARGET_KINDS : TARGET_KINDS.filter((k) => k.value === 'fixed' || k.value === kind)}
      title="A fixed attitude, or a moving target from the orbit (a site or station tracked during its pass, the Sun, nadir)"
      onChoose={(v) => {
        const s = app.store.getState().scenario;
        const cur = (s as { targets?: unknown[] }).targets?.[i];
        app.store.edit(`targets[${i}]`, retargetKind(cur, v as TargetKind, s, trackedQ), {
          label: `Target ${i + 1}: ${v}`,
          coalesceKey: null,
        });
      }}
    />
  );
}
