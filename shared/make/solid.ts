// Over 350 lines: the shapes every generator draws share the 2D/3D geometry types and the
// corner-restoring step; SizeBook at the end records the drawn sizes those shapes report.
// Solid modelling goes through @jscad/modeling; this file turns its solids into Rigshelf's flat
// triangle arrays and back, and holds the few shapes every generator draws.
import jscad from '@jscad/modeling';
import { weldAndSplit } from './repair';
import type { Corrections, DrawnSize, GeneratedMesh } from './types';
import { circleSides, formatMm, roundMm, type Resolution } from './params';

export const { booleans, extrusions, geometries, modifiers, primitives, transforms } = jscad;
export type Geom2 = ReturnType<typeof primitives.circle>;
export type Geom3 = ReturnType<typeof primitives.cuboid>;
export type Vec2 = [number, number];

/**
 * A round hole of this diameter as a polygon whose flats (not corners) touch the circle, so the
 * printed hole is never smaller than asked for: circumradius r / cos(π/n).
 */
export function holeCircle(diameterMm: number, res: Resolution, center: Vec2 = [0, 0]): Geom2 {
  const segments = circleSides(diameterMm, res);
  const radius = diameterMm / 2 / Math.cos(Math.PI / segments);
  return primitives.circle({ radius, segments, center });
}

/** An outer round edge: the polygon's corners lie on the circle, so the part is never larger than asked for. */
export function outerCircle(diameterMm: number, res: Resolution, center: Vec2 = [0, 0]): Geom2 {
  return primitives.circle({ radius: diameterMm / 2, segments: circleSides(diameterMm, res), center });
}

/** Points of a hole polygon (flats on the circle), clockwise, for use as a hole path of `region`. */
export function holePath(diameterMm: number, res: Resolution, center: Vec2 = [0, 0], phase = 0): Vec2[] {
  const n = circleSides(diameterMm, res);
  const r = diameterMm / 2 / Math.cos(Math.PI / n);
  const pts: Vec2[] = [];
  for (let k = n - 1; k >= 0; k--) {
    const a = (2 * Math.PI * (k + phase)) / n;
    pts.push([center[0] + r * Math.cos(a), center[1] + r * Math.sin(a)]);
  }
  return pts;
}

/** Points of an outer round edge (corners on the circle), counter-clockwise. */
export function reversed(path: Vec2[]): Vec2[] {
  return [...path].reverse();
}

export function circlePath(diameterMm: number, res: Resolution, center: Vec2 = [0, 0], phase = 0): Vec2[] {
  const n = circleSides(diameterMm, res);
  const r = diameterMm / 2;
  const pts: Vec2[] = [];
  for (let k = 0; k < n; k++) {
    const a = (2 * Math.PI * (k + phase)) / n;
    pts.push([center[0] + r * Math.cos(a), center[1] + r * Math.sin(a)]);
  }
  return pts;
}

/**
 * A 2D region from an outline (counter-clockwise) and holes wholly inside it (clockwise, not
 * touching each other): no boolean needed, which keeps large outlines such as gears fast.
 */
export function region(outline: Vec2[], holes: Vec2[][] = []): Geom2 {
  return holes.length === 0 ? primitives.polygon({ points: outline }) : primitives.polygon({ points: [outline, ...holes] });
}

export function rect(x0: number, y0: number, x1: number, y1: number): Geom2 {
  return primitives.polygon({
    points: [
      [x0, y0],
      [x1, y0],
      [x1, y1],
      [x0, y1],
    ],
  });
}

/**
 * JSCAD's 2D booleans snap their output to a grid of about 1e-4 of the size, so a corner of the input
 * comes back a little off; this puts every output corner that lies that close to an input corner
 * back exactly on it, so faces that must meet another solid (glue) stay where they were drawn.
 */
function restoreCorners(result: Geom2, inputs: Geom2[]): Geom2 {
  const CELL = 1e-3;
  const near = new Map<string, Vec2[]>();
  for (const g of inputs) {
    for (const side of geometries.geom2.toSides(g)) {
      for (const v of side) {
        const key = `${Math.round(v[0] / CELL)},${Math.round(v[1] / CELL)}`;
        const list = near.get(key);
        if (list) list.push([v[0], v[1]]);
        else near.set(key, [[v[0], v[1]]]);
      }
    }
  }
  const fix = (v: number[]): Vec2 => {
    const kx = Math.round(v[0] / CELL);
    const ky = Math.round(v[1] / CELL);
    for (let i = -1; i <= 1; i++)
      for (let j = -1; j <= 1; j++) {
        for (const c of near.get(`${kx + i},${ky + j}`) ?? []) {
          if (Math.abs(c[0] - v[0]) < 5e-4 && Math.abs(c[1] - v[1]) < 5e-4) return c;
        }
      }
    return [v[0], v[1]];
  };
  const sides = geometries.geom2.toSides(result).map((side) => [fix(side[0]), fix(side[1])] as [Vec2, Vec2]);
  return geometries.geom2.create(sides.filter(([a, b]) => a[0] !== b[0] || a[1] !== b[1]));
}

/** union(...solids) minus cuts, with the input corners kept exact. */
export function profileOf(solids: Geom2[], cuts: Geom2[] = []): Geom2 {
  const joined = solids.length === 1 ? solids[0] : booleans.union(...solids);
  const result = cuts.length === 0 ? joined : booleans.subtract(joined, ...cuts);
  return restoreCorners(result, [...solids, ...cuts]);
}

/** Extrudes a 2D profile (in XY) upward from z = z0 by the height. */
export function extrude(profile: Geom2, heightMm: number, z0 = 0): Geom3 {
  // Our profiles are closed already; the slice repair (gap closing) only costs time.
  const solid = extrusions.extrudeLinear({ height: heightMm, repair: false } as { height: number }, profile);
  return z0 === 0 ? solid : transforms.translateZ(z0, solid);
}

/**
 * Flat triangles of a solid, welded and with T-junctions and collinear facets repaired (see
 * repair.ts), so every edge is shared by exactly two facets.
 */
export function meshOf(solid: Geom3): GeneratedMesh {
  const polygons = geometries.geom3.toPolygons(solid);
  let triangles = 0;
  for (const p of polygons) triangles += p.vertices.length - 2;
  const positions = new Float32Array(triangles * 9);
  let o = 0;
  for (const p of polygons) {
    const v = p.vertices;
    const a = v[0];
    for (let i = 1; i + 1 < v.length; i++) {
      const b = v[i];
      const c = v[i + 1];
      positions[o++] = a[0];
      positions[o++] = a[1];
      positions[o++] = a[2];
      positions[o++] = b[0];
      positions[o++] = b[1];
      positions[o++] = b[2];
      positions[o++] = c[0];
      positions[o++] = c[1];
      positions[o++] = c[2];
    }
  }
  const repaired = weldAndSplit(positions);
  return { positions: repaired, triangles: repaired.length / 9 };
}

export interface Layer {
  region: Geom2;
  z0: number;
  z1: number;
  /** The layer's prism after 3D cuts that leave its top and bottom faces alone (a cross hole); default the plain extrusion. */
  solid?: Geom3;
}

const isCap = (normalZ: number) => Math.abs(normalZ) > 0.999999;

/** Where two stacked layers differ: the part of the lower one left uncovered (facing up) and the overhang of the upper one (facing down). */
export interface Step {
  up?: Geom2;
  down?: Geom2;
}

/**
 * A solid made of prisms stacked along z (each layer's z0 is the previous layer's z1). Walls and the
 * outer caps come from extrudeLinear; between two layers only the faces where their regions differ
 * are drawn (`steps[i]` between layer i and i + 1, built by the caller from the same loops), so the
 * result is one closed surface without a 3D boolean.
 */
export function stackLayers(layers: Layer[], steps: Step[]): GeneratedMesh {
  const soup: number[] = [];
  const push = (polygon: { vertices: number[][] }) => {
    const v = polygon.vertices;
    const a = v[0];
    for (let i = 1; i + 1 < v.length; i++) {
      const b = v[i];
      const c = v[i + 1];
      soup.push(a[0], a[1], a[2], b[0], b[1], b[2], c[0], c[1], c[2]);
    }
  };
  const capsOf = (g: Geom2, z: number, up: boolean) => {
    if (geometries.geom2.toSides(g).length === 0) return;
    for (const poly of geometries.geom3.toPolygons(extrude(g, 1, z - (up ? 1 : 0)))) {
      const n = geometries.poly3.plane(poly);
      if (isCap(n[2]) && n[2] > 0 === up) push(poly);
    }
  };
  layers.forEach((layer, i) => {
    const prism = layer.solid ?? extrude(layer.region, layer.z1 - layer.z0, layer.z0);
    for (const poly of geometries.geom3.toPolygons(prism)) {
      const n = geometries.poly3.plane(poly);
      const z = poly.vertices[0][2];
      const onCap = isCap(n[2]) && (Math.abs(z - layer.z0) < 1e-9 || Math.abs(z - layer.z1) < 1e-9);
      if (!onCap) push(poly);
      else if (n[2] < 0 && i === 0) push(poly);
      else if (n[2] > 0 && i === layers.length - 1) push(poly);
    }
    const step = steps[i];
    if (i + 1 < layers.length && step) {
      if (step.up) capsOf(step.up, layer.z1, true);
      if (step.down) capsOf(step.down, layer.z1, false);
    }
  });
  const positions = weldAndSplit(soup);
  return { positions, triangles: positions.length / 9 };
}

/**
 * A block extruded along y from a profile drawn in the xz plane (profile x → x, profile y → z),
 * covering y0..y1: for cross holes that run along y.
 */
export function extrudeAlongY(profile: Geom2, y0: number, y1: number): Geom3 {
  // (u, v, w) → (u, y1 − w, v): a proper rotation, so facets stay wound outward.
  return remap(extrusions.extrudeLinear({ height: y1 - y0 }, profile), (v) => [v[0], y1 - v[2], v[1]]);
}

function remap(solid: Geom3, map: (v: number[]) => [number, number, number]): Geom3 {
  return geometries.geom3.create(geometries.geom3.toPolygons(solid).map((poly) => geometries.poly3.create(poly.vertices.map(map))));
}

/** A block extruded along x from a profile drawn in the yz plane (profile x → y, profile y → z), covering x0..x1. */
export function extrudeAlongX(profile: Geom2, x0: number, x1: number): Geom3 {
  // (u, v, w) → (x0 + w, u, v): a cyclic swap of axes, a proper rotation.
  return remap(extrusions.extrudeLinear({ height: x1 - x0 }, profile), (v) => [x0 + v[2], v[0], v[1]]);
}

/** A plane solids are glued along: axis (0 x, 1 y, 2 z) = at, optionally only faces inside a box. */
export interface GluePlane {
  axis: 0 | 1 | 2;
  at: number;
  within?: { min: [number, number, number]; max: [number, number, number] };
}

/**
 * Joins solids that touch along faces in given planes, each contact face of one solid covering
 * exactly the matching face of the other: those faces are dropped (the welding in meshOf / stackLayers
 * closes the seams). The caller guarantees nothing else of these solids lies in those planes.
 */
export function glue(parts: Geom3[], planes: GluePlane[]): Geom3 {
  const inPlane = (poly: { vertices: number[][] }, n: number[], plane: GluePlane) =>
    Math.abs(Math.abs(n[plane.axis]) - 1) < 1e-9 &&
    poly.vertices.every(
      (v) =>
        Math.abs(v[plane.axis] - plane.at) < 1e-7 && (!plane.within || v.every((c, i) => c >= plane.within!.min[i] - 1e-7 && c <= plane.within!.max[i] + 1e-7)),
    );
  const kept = parts.flatMap((part) =>
    geometries.geom3.toPolygons(part).filter((poly) => {
      const n = geometries.poly3.plane(poly);
      return !planes.some((plane) => inPlane(poly, n, plane));
    }),
  );
  return geometries.geom3.create(kept);
}

/**
 * A block x0..x1 × y0..y1 × z0..z1 with a round hole along y through (holeX, holeZ), drawn as an
 * extrusion along y so the hole needs no 3D boolean.
 */
export function blockWithHoleAlongY(
  x0: number,
  x1: number,
  y0: number,
  y1: number,
  z0: number,
  z1: number,
  hole: { diameterMm: number; x: number; z: number } | null,
  res: Resolution,
): Geom3 {
  const outline: Vec2[] = [
    [x0, z0],
    [x1, z0],
    [x1, z1],
    [x0, z1],
  ];
  return extrudeAlongY(region(outline, hole ? [holePath(hole.diameterMm, res, [hole.x, hole.z])] : []), y0, y1);
}

/** Same along x: a block with a round hole along x through (holeY, holeZ). */
export function blockWithHoleAlongX(
  x0: number,
  x1: number,
  y0: number,
  y1: number,
  z0: number,
  z1: number,
  hole: { diameterMm: number; y: number; z: number } | null,
  res: Resolution,
): Geom3 {
  const outline: Vec2[] = [
    [y0, z0],
    [y1, z0],
    [y1, z1],
    [y0, z1],
  ];
  return extrudeAlongX(region(outline, hole ? [holePath(hole.diameterMm, res, [hole.y, hole.z])] : []), x0, x1);
}

/**
 * A bore of this diameter (flats on the circle) centred at c with a slot of half-width `gap` leaving
 * it along direction +x (dir 1) or −x (dir −1): the points clockwise from the slot's lower edge
 * (as seen turning away from the slot) round to its other edge, for splicing into an outline.
 */
export function slottedBoreArc(diameterMm: number, res: Resolution, gap: number, c: Vec2 = [0, 0], dir: 1 | -1 = 1): Vec2[] {
  const n = circleSides(diameterMm, res);
  const R = diameterMm / 2 / Math.cos(Math.PI / n);
  const x = Math.sqrt(R * R - gap * gap);
  const limit = Math.asin(gap / R);
  const local: Vec2[] = [[x, -gap]];
  for (let k = n - 1; k >= 1; k--) {
    const a = (2 * Math.PI * k) / n;
    if (a > limit + 1e-9 && a < 2 * Math.PI - limit - 1e-9) local.push([R * Math.cos(a), R * Math.sin(a)]);
  }
  local.push([x, gap]);
  // Turning by 180° keeps the order clockwise.
  return local.map(([px, py]) => [c[0] + dir * px, c[1] + dir * py] as Vec2);
}

/** The triangles back as a JSCAD solid, for the file serializers. */
export function solidOfMesh(mesh: GeneratedMesh): Geom3 {
  const p = mesh.positions;
  const faces: [number, number, number][][] = [];
  for (let i = 0; i + 8 < p.length; i += 9) {
    faces.push([
      [p[i], p[i + 1], p[i + 2]],
      [p[i + 3], p[i + 4], p[i + 5]],
      [p[i + 6], p[i + 7], p[i + 8]],
    ]);
  }
  return geometries.geom3.fromPoints(faces);
}

/** Applies a calibration to one size and records it, with a sentence when it moved. */
export class SizeBook {
  readonly sizes: DrawnSize[] = [];
  readonly notes: string[] = [];
  constructor(private readonly corrections: Corrections = {}) {}

  hole(label: string, nominalMm: number): number {
    return this.record(label, nominalMm, this.corrections.holeMm ?? 0);
  }

  outer(label: string, nominalMm: number): number {
    return this.record(label, nominalMm, this.corrections.outerMm ?? 0);
  }

  /** A size that is drawn as asked (no correction), recorded for the echo. */
  plain(label: string, mm: number): number {
    this.sizes.push({ label, nominalMm: roundMm(mm), drawnMm: roundMm(mm) });
    return mm;
  }

  private record(label: string, nominalMm: number, correction: number): number {
    const drawnMm = nominalMm + correction;
    this.sizes.push({ label, nominalMm: roundMm(nominalMm), drawnMm: roundMm(drawnMm) });
    if (correction !== 0) {
      this.notes.push(`${label} drawn at ${formatMm(drawnMm)} so it prints at ${formatMm(nominalMm)} on your printer.`);
    }
    return drawnMm;
  }
}
