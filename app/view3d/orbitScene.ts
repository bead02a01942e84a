/**
 * The renderer-free orbit scene: the Earth to scale (scene unit = the WGS-84 equatorial radius),
 * turned by its rotation at the playback time, with a graticule every 30°, the equator and the
 * prime meridian; the orbit arc over the sampled span; the spacecraft (dimmed in the Earth's
 * shadow); arrows from the spacecraft toward the Sun and the Moon; the ground sites; and the line
 * of sight from the spacecraft to the site the current segment tracks. Scene axes are the engine's
 * inertial frame (EME2000), as in the attitude view (adapter.ts): Z up through the camera, never
 * by rotating the data.
 *
 * Geometry comes from the engine (orbit/viewSamples.ts, sampled once per run set); `setTime`
 * interpolates it (orbitViewAt) and moves objects in place: no allocation per frame.
 */
import {
  AmbientLight,
  BufferAttribute,
  BufferGeometry,
  Color,
  DirectionalLight,
  Group,
  Line,
  LineBasicMaterial,
  LineLoop,
  LineSegments,
  Mesh,
  MeshBasicMaterial,
  MeshLambertMaterial,
  Scene,
  SphereGeometry,
} from 'three';
import type { Object3D } from 'three';
import { createOrbitViewPoint, earthFixedPointAt, orbitViewAt, type OrbitViewSamples } from '../engine/orbit/viewSamples';
import { PENUMBRA, SUNLIT, UMBRA } from '../engine/orbit/sky';
import { WGS84_A_M } from '../engine/orbit/sites';
import { quaternionFromArray } from './adapter';
import { wireSpherePositions } from './commonContent';
import type { LabelFactory } from './labels';
import { createKit, cssHex, disposeKit, disposeTree, VectorArrow, type Kit } from './primitives';

/** A ground site in Earth-fixed axes (m). */
export interface OrbitViewSite {
  label: string;
  ecefM: Float64Array;
}

/** An interval in which the current segment points at a site: slew start to hold end (s). */
export interface OrbitViewLink {
  t0: number;
  t1: number;
  /** Tracking starts (the slew has arrived). */
  trackStartS: number;
  /** Index into `sites`. */
  site: number;
  /** The segment's target label. */
  target: string;
}

export interface OrbitViewData {
  samples: OrbitViewSamples;
  sites: OrbitViewSite[];
  links: OrbitViewLink[];
  vehicleName: string;
}

/** What the scene shows at the current time (tests and the HUD read it). */
export interface OrbitViewState {
  t: number;
  valid: boolean;
  /** sky.ts SUNLIT, PENUMBRA, UMBRA or ANNULAR. */
  shadow: number;
  sunFraction: number;
  /** The site the line of sight goes to, or null. */
  linkSite: string | null;
  tracking: boolean;
}

export const ORBIT_COLORS = {
  background: 0x0b0f14,
  earth: 0x24507a,
  graticule: 0x5a7896,
  equator: 0xffd166,
  primeMeridian: 0xff8c5a,
  arc: 0x8fb0cf,
  sun: 0xffcc33,
  moon: 0xb8c4d6,
  craftLit: 0xfff3b0,
  craftShadow: 0x4a505a,
  site: 0xf2f4f7,
  losTracking: 0x3fd68b,
  losSlewing: 0xf0a020,
} as const;

/** Scene sizes in Earth radii (our own choices, common practice, no source). */
const SIZES = { craft: 0.04, site: 0.016, arrow: 0.8, arrowRadius: 0.009, label: 0.03 };

/** Shadow state words (the HUD's and the tests'). */
export function shadowText(shadow: number): string {
  return shadow === SUNLIT
    ? 'sunlit'
    : shadow === UMBRA
      ? 'eclipse: umbra'
      : shadow === PENUMBRA
        ? 'eclipse: penumbra'
        : 'eclipse: annular';
}

export class OrbitScene {
  readonly scene = new Scene();
  readonly hudScene = new Scene();
  readonly kit: Kit;
  readonly state: OrbitViewState = { t: NaN, valid: false, shadow: SUNLIT, sunFraction: 1, linkSite: null, tracking: false };
  data: OrbitViewData | null = null;
  private readonly earth = new Group();
  private readonly sitesGroup = new Group();
  private readonly content = new Group();
  private readonly sunLight = new DirectionalLight(0xffffff, 2.4);
  private readonly craft: Mesh;
  private readonly craftMat: MeshBasicMaterial;
  private readonly sunArrow: VectorArrow;
  private readonly moonArrow: VectorArrow;
  private readonly los: Line;
  private readonly losMat: LineBasicMaterial;
  private readonly losPos = new Float32Array(6);
  private readonly point = createOrbitViewPoint();
  private readonly sitePos = new Float64Array(3);
  private readonly lit = new Color(ORBIT_COLORS.craftLit);
  private readonly dark = new Color(ORBIT_COLORS.craftShadow);
  private sunLabel: Object3D | null = null;
  private moonLabel: Object3D | null = null;
  private craftLabel: Object3D | null = null;
  private losLabels: Object3D[] = [];
  private hudTitle: Object3D | null = null;
  private hudShadow: Object3D | null = null;
  private hudShadowState = NaN;
  private arc: Line | null = null;

  constructor(labels: LabelFactory | null) {
    this.kit = createKit(labels);
    this.scene.add(new AmbientLight(0xffffff, 0.45), this.sunLight, this.earth, this.content);
    // Earth: a sphere with its poles on the Earth-fixed Z axis (three's sphere has them on Y).
    const g = new SphereGeometry(1, 72, 36);
    g.rotateX(Math.PI / 2);
    const globe = new Mesh(g, new MeshLambertMaterial({ color: ORBIT_COLORS.earth }));
    globe.name = 'earth';
    const grat = new BufferGeometry();
    grat.setAttribute('position', new BufferAttribute(wireSpherePositions(1.002), 3));
    const graticule = new LineSegments(grat, new LineBasicMaterial({ color: ORBIT_COLORS.graticule, transparent: true, opacity: 0.55 }));
    graticule.name = 'graticule';
    const eq = new Float32Array(3 * 180);
    for (let i = 0; i < 180; i++) {
      const a = (2 * Math.PI * i) / 180;
      eq[3 * i] = 1.004 * Math.cos(a);
      eq[3 * i + 1] = 1.004 * Math.sin(a);
    }
    const eqg = new BufferGeometry();
    eqg.setAttribute('position', new BufferAttribute(eq, 3));
    const equator = new LineLoop(eqg, new LineBasicMaterial({ color: ORBIT_COLORS.equator }));
    equator.name = 'equator';
    const pm = new Float32Array(3 * 91);
    for (let i = 0; i <= 90; i++) {
      const lat = -Math.PI / 2 + (Math.PI * i) / 90;
      pm[3 * i] = 1.004 * Math.cos(lat);
      pm[3 * i + 2] = 1.004 * Math.sin(lat);
    }
    const pmg = new BufferGeometry();
    pmg.setAttribute('position', new BufferAttribute(pm, 3));
    const prime = new Line(pmg, new LineBasicMaterial({ color: ORBIT_COLORS.primeMeridian }));
    prime.name = 'prime-meridian';
    this.earth.name = 'earth-fixed';
    this.earth.add(globe, graticule, equator, prime, this.sitesGroup);

    this.craftMat = new MeshBasicMaterial({ color: ORBIT_COLORS.craftLit });
    this.craft = new Mesh(this.kit.dot, this.craftMat);
    this.craft.scale.setScalar(SIZES.craft);
    this.craft.name = 'spacecraft';
    this.sunArrow = new VectorArrow(this.kit, { color: ORBIT_COLORS.sun, radius: SIZES.arrowRadius });
    this.sunArrow.name = 'sun-direction';
    this.moonArrow = new VectorArrow(this.kit, { color: ORBIT_COLORS.moon, radius: SIZES.arrowRadius });
    this.moonArrow.name = 'moon-direction';
    const lg = new BufferGeometry();
    lg.setAttribute('position', new BufferAttribute(this.losPos, 3));
    this.losMat = new LineBasicMaterial({ color: ORBIT_COLORS.losTracking });
    this.los = new Line(lg, this.losMat);
    this.los.name = 'line-of-sight';
    this.los.frustumCulled = false;
    this.los.visible = false;
    this.content.add(this.craft, this.sunArrow, this.moonArrow, this.los);
    if (labels) {
      this.sunLabel = labels('Sun', { color: cssHex(ORBIT_COLORS.sun), heightFraction: SIZES.label, anchorX: 0, anchorY: 1 });
      this.moonLabel = labels('Moon', { color: cssHex(ORBIT_COLORS.moon), heightFraction: SIZES.label, anchorX: 1, anchorY: 0 });
      this.hudTitle = labels('Orbit view: EME2000, Earth to scale, Z up', {
        color: '#e6edf3',
        anchorX: 0,
        anchorY: 1,
        heightFraction: 0.036,
        screenSpace: true,
      });
      this.content.add(this.sunLabel, this.moonLabel);
      this.hudScene.add(this.hudTitle);
    }
  }

  /** Build the per-run-set content (arc, sites, labels) and pose at the current time. */
  setData(data: OrbitViewData | null): void {
    this.data = data;
    if (this.arc) {
      this.content.remove(this.arc);
      disposeTree(this.arc, this.kit);
      this.arc = null;
    }
    for (const l of this.losLabels) disposeTree(l, this.kit);
    this.losLabels = [];
    if (this.craftLabel) {
      this.content.remove(this.craftLabel);
      disposeTree(this.craftLabel, this.kit);
      this.craftLabel = null;
    }
    disposeTree(this.sitesGroup, this.kit);
    this.sitesGroup.clear();
    if (!data) return;
    const s = data.samples;
    const pos = new Float32Array(3 * s.n);
    for (let i = 0; i < 3 * s.n; i++) pos[i] = s.rM[i]! / WGS84_A_M;
    const ag = new BufferGeometry();
    ag.setAttribute('position', new BufferAttribute(pos, 3));
    this.arc = new Line(ag, new LineBasicMaterial({ color: ORBIT_COLORS.arc, transparent: true, opacity: 0.75 }));
    this.arc.name = 'orbit-arc';
    this.content.add(this.arc);
    const siteMat = new MeshBasicMaterial({ color: ORBIT_COLORS.site });
    for (const site of data.sites) {
      const m = new Mesh(this.kit.dot, siteMat);
      m.scale.setScalar(SIZES.site);
      m.position.set(site.ecefM[0]! / WGS84_A_M, site.ecefM[1]! / WGS84_A_M, site.ecefM[2]! / WGS84_A_M);
      m.name = `site:${site.label}`;
      this.sitesGroup.add(m);
    }
    const labels = this.kit.labels;
    if (labels) {
      this.craftLabel = labels(data.vehicleName, { color: cssHex(ORBIT_COLORS.craftLit), heightFraction: SIZES.label, anchorX: 1.08 });
      this.content.add(this.craftLabel);
      // One line-of-sight label per site, shown while a link to it is current.
      this.losLabels = data.sites.map((site) => {
        const l = labels(`line of sight: ${site.label}`, {
          color: cssHex(ORBIT_COLORS.losTracking),
          heightFraction: SIZES.label,
          anchorX: 0,
        });
        l.visible = false;
        this.content.add(l);
        return l;
      });
    }
    this.hudShadowState = NaN;
    this.setTime(Number.isFinite(this.state.t) ? this.state.t : 0);
  }

  /** Pose everything at plan time t (clamped to the sampled span). */
  setTime(t: number): void {
    this.state.t = t;
    const d = this.data;
    if (!d) {
      this.state.valid = false;
      return;
    }
    const s = d.samples;
    const p = orbitViewAt(this.point, s, Math.min(Math.max(t, 0), s.endS));
    this.state.valid = p.valid;
    if (!p.valid) return;
    const R = WGS84_A_M;
    quaternionFromArray(this.earth.quaternion, p.qInertialFromEcef);
    const x = p.rM[0]! / R,
      y = p.rM[1]! / R,
      z = p.rM[2]! / R;
    this.craft.position.set(x, y, z);
    this.state.shadow = p.shadow;
    this.state.sunFraction = p.sunFraction;
    this.craftMat.color.copy(this.dark).lerp(this.lit, p.sunFraction);
    // The light comes from the Sun (its parallax between Earth centre and spacecraft is ~1e-4 rad).
    this.sunLight.position.set(p.sunDir[0]!, p.sunDir[1]!, p.sunDir[2]!);
    const L = SIZES.arrow;
    this.sunArrow.position.set(x, y, z);
    this.sunArrow.set(p.sunDir[0]!, p.sunDir[1]!, p.sunDir[2]!, L);
    this.moonArrow.position.set(x, y, z);
    this.moonArrow.set(p.moonDir[0]!, p.moonDir[1]!, p.moonDir[2]!, L);
    this.sunLabel?.position.set(x + 1.1 * L * p.sunDir[0]!, y + 1.1 * L * p.sunDir[1]!, z + 1.1 * L * p.sunDir[2]!);
    this.moonLabel?.position.set(x + 1.1 * L * p.moonDir[0]!, y + 1.1 * L * p.moonDir[1]!, z + 1.1 * L * p.moonDir[2]!);
    this.craftLabel?.position.set(x, y, z);
    // The current segment's site, if it tracks one.
    let link = -1;
    for (let i = 0; i < d.links.length; i++) {
      const l = d.links[i]!;
      if (t >= l.t0 && t <= l.t1) link = i;
    }
    for (const l of this.losLabels) l.visible = false;
    if (link >= 0) {
      const l = d.links[link]!;
      const site = d.sites[l.site]!;
      earthFixedPointAt(this.sitePos, p, site.ecefM);
      const sx = this.sitePos[0]! / R,
        sy = this.sitePos[1]! / R,
        sz = this.sitePos[2]! / R;
      this.losPos[0] = x;
      this.losPos[1] = y;
      this.losPos[2] = z;
      this.losPos[3] = sx;
      this.losPos[4] = sy;
      this.losPos[5] = sz;
      (this.los.geometry.getAttribute('position') as BufferAttribute).needsUpdate = true;
      this.los.visible = true;
      this.state.tracking = t >= l.trackStartS;
      this.losMat.color.setHex(this.state.tracking ? ORBIT_COLORS.losTracking : ORBIT_COLORS.losSlewing);
      this.state.linkSite = site.label;
      const lab = this.losLabels[l.site];
      if (lab) {
        lab.visible = true;
        lab.position.set(sx, sy, sz);
      }
    } else {
      this.los.visible = false;
      this.state.linkSite = null;
      this.state.tracking = false;
    }
    this.updateHudShadow(p.shadow);
  }

  /** The HUD's eclipse line, rebuilt only when the state changes. */
  private updateHudShadow(shadow: number): void {
    if (shadow === this.hudShadowState || !this.kit.labels) return;
    this.hudShadowState = shadow;
    if (this.hudShadow) {
      this.hudScene.remove(this.hudShadow);
      disposeTree(this.hudShadow, this.kit);
    }
    this.hudShadow = this.kit.labels(`spacecraft ${shadowText(shadow)}`, {
      color: shadow === SUNLIT ? cssHex(ORBIT_COLORS.sun) : '#9aa7b4',
      anchorX: 0,
      anchorY: 1,
      heightFraction: 0.034,
      screenSpace: true,
    });
    this.hudShadow.name = `hud-shadow:${shadowText(shadow)}`;
    this.hudScene.add(this.hudShadow);
  }

  /** The spacecraft marker's position (scene units, Earth radii) at the current time. */
  craftPosition(): { x: number; y: number; z: number } {
    return this.craft.position;
  }

  /** Place the HUD rows for a viewport of the given aspect (the HUD camera spans y ∈ [−1, 1]). */
  layoutHud(aspect: number): void {
    this.hudTitle?.position.set(-aspect + 0.04, 0.96, 0);
    this.hudShadow?.position.set(-aspect + 0.04, 0.96 - Math.max(0.095, 1.2 * (this.hudTitle?.scale.y ?? 0.07)), 0);
  }

  dispose(): void {
    disposeTree(this.scene, this.kit);
    disposeTree(this.hudScene, this.kit);
    disposeKit(this.kit);
  }
}
