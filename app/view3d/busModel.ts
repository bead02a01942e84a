/**
 * The generic spacecraft bus drawn in the 3D view: a small JSON description of our own
 * (assets/bus-model.json, format "slewsmith.bus-model" v1) checked here and built into meshes.
 * Parts are boxes and cylinders placed in BODY axes, so the built group takes the attitude
 * quaternion directly (adapter.ts).
 */
import { BoxGeometry, CylinderGeometry, Group, Mesh, MeshStandardMaterial, Vector3 } from 'three';
import type { Issue, Result } from '../engine/errors';
import { describe, fail, IssueList, ok } from '../engine/errors';

export interface BusPartBox {
  name: string;
  shape: 'box';
  size: [number, number, number];
  center: [number, number, number];
  color: string;
  metalness: number;
  roughness: number;
}

export interface BusPartCylinder {
  name: string;
  shape: 'cylinder';
  radius: number;
  length: number;
  /** Cylinder axis in body axes (need not be unit). */
  axis: [number, number, number];
  center: [number, number, number];
  color: string;
  metalness: number;
  roughness: number;
}

export type BusPart = BusPartBox | BusPartCylinder;

export interface BusModel {
  name: string;
  /** Unit body axis of the main instrument (the default trail axis). */
  boresightBody: [number, number, number];
  parts: BusPart[];
}

export const BUS_MODEL_FORMAT = 'slewsmith.bus-model';

const isObj = (v: unknown): v is Record<string, unknown> => typeof v === 'object' && v !== null && !Array.isArray(v);

function vec3(list: IssueList, path: string, v: unknown, nonZero: boolean, positive = false): [number, number, number] | null {
  if (!Array.isArray(v) || v.length !== 3) {
    list.add(path, 'vector3', `${path} must be an array of 3 numbers (got ${describe(v)})`);
    return null;
  }
  let good = true;
  for (let i = 0; i < 3; i++) good = (positive ? list.positive(`${path}[${i}]`, v[i]) : list.finite(`${path}[${i}]`, v[i])) && good;
  if (!good) return null;
  const out = v as [number, number, number];
  if (nonZero && Math.hypot(out[0], out[1], out[2]) === 0) {
    list.add(path, 'non-zero', `${path} must not be the zero vector`);
    return null;
  }
  return out;
}

function unit01(list: IssueList, path: string, v: unknown, dflt: number): number {
  if (v === undefined) return dflt;
  if (!list.finite(path, v)) return dflt;
  if (v < 0 || v > 1) list.add(path, 'range', `${path} must lie in [0, 1] (got ${v})`);
  return v;
}

/** Check a parsed JSON value; every problem is reported, each with its path and rule. */
export function parseBusModel(json: unknown): Result<BusModel> {
  const list = new IssueList();
  if (!isObj(json)) return fail([{ path: '', rule: 'object', message: `the bus model must be a JSON object (got ${describe(json)})` }]);
  if (json.format !== BUS_MODEL_FORMAT) list.add('format', 'format', `format must be "${BUS_MODEL_FORMAT}" (got ${describe(json.format)})`);
  if (json.version !== 1) list.add('version', 'version', `version must be 1 (got ${describe(json.version)})`);
  const name = typeof json.name === 'string' ? json.name : '';
  if (typeof json.name !== 'string') list.add('name', 'string', `name must be a string (got ${describe(json.name)})`);
  const bore = vec3(list, 'boresightBody', json.boresightBody, true);
  const parts: BusPart[] = [];
  if (!Array.isArray(json.parts) || json.parts.length === 0) {
    list.add('parts', 'non-empty', `parts must be a non-empty array (got ${describe(json.parts)})`);
  } else {
    json.parts.forEach((p: unknown, i: number) => {
      const path = `parts[${i}]`;
      if (!isObj(p)) {
        list.add(path, 'object', `${path} must be an object (got ${describe(p)})`);
        return;
      }
      const pname = typeof p.name === 'string' && p.name ? p.name : '';
      if (!pname) list.add(`${path}.name`, 'string', `${path}.name must be a non-empty string (got ${describe(p.name)})`);
      const center = vec3(list, `${path}.center`, p.center, false);
      const color = typeof p.color === 'string' && /^#[0-9a-fA-F]{6}$/.test(p.color) ? p.color : null;
      if (!color) list.add(`${path}.color`, 'hex-color', `${path}.color must be "#rrggbb" (got ${describe(p.color)})`);
      const metalness = unit01(list, `${path}.metalness`, p.metalness, 0.3);
      const roughness = unit01(list, `${path}.roughness`, p.roughness, 0.6);
      if (p.shape === 'box') {
        const size = vec3(list, `${path}.size`, p.size, false, true);
        if (size && center && color) parts.push({ name: pname, shape: 'box', size, center, color, metalness, roughness });
      } else if (p.shape === 'cylinder') {
        const okR = list.positive(`${path}.radius`, p.radius);
        const okL = list.positive(`${path}.length`, p.length);
        const axis = vec3(list, `${path}.axis`, p.axis, true);
        if (okR && okL && axis && center && color)
          parts.push({
            name: pname,
            shape: 'cylinder',
            radius: p.radius as number,
            length: p.length as number,
            axis,
            center,
            color,
            metalness,
            roughness,
          });
      } else {
        list.add(`${path}.shape`, 'enum', `${path}.shape must be "box" or "cylinder" (got ${describe(p.shape)})`);
      }
    });
  }
  if (!list.empty) return fail(list.items as Issue[]);
  const n = Math.hypot(bore![0], bore![1], bore![2]);
  return ok({ name, boresightBody: [bore![0] / n, bore![1] / n, bore![2] / n], parts });
}

const UP = new Vector3(0, 1, 0);

/** Build the bus as a group of meshes in body axes. `opacity` < 1 for an overlaid second run. */
export function buildBusGroup(model: BusModel, opacity = 1): Group {
  const g = new Group();
  g.name = `bus:${model.name}`;
  const dir = new Vector3();
  for (const p of model.parts) {
    const mat = new MeshStandardMaterial({
      color: p.color,
      metalness: p.metalness,
      roughness: p.roughness,
      transparent: opacity < 1,
      opacity,
      depthWrite: opacity >= 1,
    });
    let mesh: Mesh;
    if (p.shape === 'box') {
      mesh = new Mesh(new BoxGeometry(p.size[0], p.size[1], p.size[2]), mat);
    } else {
      mesh = new Mesh(new CylinderGeometry(p.radius, p.radius, p.length, 28, 1), mat);
      // CylinderGeometry runs along +Y; turn it onto the part's axis.
      dir.set(p.axis[0], p.axis[1], p.axis[2]).normalize();
      mesh.quaternion.setFromUnitVectors(UP, dir);
    }
    mesh.position.set(p.center[0], p.center[1], p.center[2]);
    mesh.name = p.name;
    g.add(mesh);
  }
  return g;
}
