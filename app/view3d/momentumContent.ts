/**
 * One run's wheel momentum in the inset (BODY axes): each wheel's momentum h_i a_i as an arrow
 * along its spin axis, the total H = Σ h_i a_i, the wheels' ±h_max ranges as faint lines and the
 * envelope. The total arrow's colour shows the fraction of the envelope used in H's direction
 * (style.ts: normal < 0.7 ≤ amber < 0.9 ≤ red).
 */
import { BufferAttribute, BufferGeometry, Group, LineBasicMaterial, LineSegments } from 'three';
import { buildEnvelopeObject, envelopeDisplayScale, momentumFraction } from './envelope';
import type { EnvelopeObject } from './envelope';
import type { Kit } from './primitives';
import { cssHex, VectorArrow } from './primitives';
import type { SampleCursor } from './sampling';
import { COLORS, MOMENTUM_COLORS, momentumLevel, SIZES, WHEEL_COLORS } from './style';
import type { MomentumLevel } from './style';
import type { ViewRun } from './types';

export class MomentumContent {
  readonly group = new Group();
  /** Scene units per N·m·s. */
  readonly scale: number;
  readonly envelope: EnvelopeObject | null;
  readonly wheelArrows: VectorArrow[] = [];
  readonly totalArrow: VectorArrow;
  /** Last computed total momentum (N·m·s, body axes), fraction and level, for tests and readouts. */
  readonly H = new Float64Array(3);
  fraction = 0;
  level: MomentumLevel = 'normal';

  private readonly run: ViewRun;
  private readonly h: Float64Array;
  private readonly dir = new Float64Array(3);
  private readonly totalLabel: { position: { set(x: number, y: number, z: number): unknown }; visible: boolean } | null;

  constructor(kit: Kit, run: ViewRun, opts: { drawEnvelope: boolean; opacity: number; scale?: number }) {
    this.run = run;
    const nW = run.trace.nWheels;
    this.h = new Float64Array(nW);
    this.scale = opts.scale ?? envelopeDisplayScale(run.momentumEnvelope);
    this.group.name = `momentum:${run.label}`;

    this.envelope = opts.drawEnvelope ? buildEnvelopeObject(run.momentumEnvelope, this.scale) : null;
    if (this.envelope) this.group.add(this.envelope.group);

    // Wheel ranges: −h_max a_i … +h_max a_i.
    const seg = new Float32Array(6 * nW);
    for (let i = 0; i < nW; i++) {
      const hm = run.maxMomentumNms[i]! * this.scale;
      for (let k = 0; k < 3; k++) {
        seg[6 * i + k] = -hm * run.wheelAxes[3 * i + k]!;
        seg[6 * i + 3 + k] = hm * run.wheelAxes[3 * i + k]!;
      }
    }
    const rg = new BufferGeometry();
    rg.setAttribute('position', new BufferAttribute(seg, 3));
    const ranges = new LineSegments(rg, new LineBasicMaterial({ color: COLORS.wheelAxis, transparent: true, opacity: 0.8 * opts.opacity }));
    ranges.name = 'wheel-ranges';
    this.group.add(ranges);

    for (let i = 0; i < nW; i++) {
      const color = WHEEL_COLORS[i % WHEEL_COLORS.length]!;
      const a = new VectorArrow(kit, { color, opacity: opts.opacity, radius: 0.014 });
      a.name = `wheel-${i + 1}`;
      this.wheelArrows.push(a);
      this.group.add(a);
      if (kit.labels && opts.drawEnvelope) {
        const lab = kit.labels(`${i + 1}`, { color: cssHex(color), heightFraction: SIZES.insetLabelHeight * 0.85 });
        lab.position.set(seg[6 * i + 3]!, seg[6 * i + 4]!, seg[6 * i + 5]).multiplyScalar(1.1);
        this.group.add(lab);
      }
    }
    this.totalArrow = new VectorArrow(kit, { color: MOMENTUM_COLORS.normal, opacity: opts.opacity, radius: 0.022 });
    this.totalArrow.name = 'total-momentum';
    this.group.add(this.totalArrow);
    if (kit.labels && opts.drawEnvelope) {
      const lab = kit.labels('H', { color: '#f2f4f7', anchorX: 0, heightFraction: SIZES.insetLabelHeight });
      this.group.add(lab);
      this.totalLabel = lab;
    } else this.totalLabel = null;
  }

  /** Pose every arrow for the sample cursor (wheel momenta linearly interpolated). No allocation. */
  update(c: SampleCursor): void {
    const tr = this.run.trace,
      nW = tr.nWheels,
      ax = this.run.wheelAxes,
      h = this.h,
      H = this.H;
    if (c.i < 0) return;
    const b0 = nW * c.i,
      b1 = nW * c.i1,
      al = c.alpha;
    H[0] = H[1] = H[2] = 0;
    for (let i = 0; i < nW; i++) {
      const hi = (1 - al) * tr.hWheel[b0 + i]! + al * tr.hWheel[b1 + i]!;
      h[i] = hi;
      const x = ax[3 * i]!,
        y = ax[3 * i + 1]!,
        z = ax[3 * i + 2]!;
      H[0] += hi * x;
      H[1] += hi * y;
      H[2] += hi * z;
      const s = hi < 0 ? -1 : 1;
      this.wheelArrows[i]!.set(s * x, s * y, s * z, Math.abs(hi) * this.scale);
    }
    const nH = Math.hypot(H[0], H[1], H[2]);
    this.totalArrow.set(H[0], H[1], H[2], nH * this.scale);
    this.fraction = momentumFraction(H, this.run.momentumCapacity, this.dir);
    const level = momentumLevel(this.fraction);
    if (level !== this.level) {
      this.level = level;
      this.totalArrow.material.color.setHex(MOMENTUM_COLORS[level]);
    }
    if (this.totalLabel) {
      const k = this.scale * 1.06;
      this.totalLabel.position.set(H[0] * k, H[1] * k, H[2] * k);
      this.totalLabel.visible = nH > 0;
    }
  }
}
