// Solid modelling goes through @jscad/modeling; this file turns its solids into Rigshelf's flat
// triangle arrays and back, and holds the few shapes every generator draws.
import jscad from '@jscad/modeling';
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

export function rect(x0: number, y0: number, x1: number, y1: number): Geom2 {
  return primitives.polygon({ points: [[x0, y0], [x1, y0], [x1, y1], [x0, y1]] });
}

/** Extrudes a 2D profile (in XY) upward from z = z0 by the height. */
export function extrude(profile: Geom2, heightMm: number, z0 = 0): Geom3 {
  const solid = extrusions.extrudeLinear({ height: heightMm }, profile);
  return z0 === 0 ? solid : transforms.translateZ(z0, solid);
}

/**
 * Flat triangles of a solid. Booleans in 3D can leave T-junctions (a corner of one facet on the edge
 * of another); generalize inserts them so every edge is shared by exactly two facets.
 */
export function meshOf(solid: Geom3, needsRepair: boolean): GeneratedMesh {
  const clean = needsRepair ? modifiers.generalize({ snap: true, triangulate: true }, solid) : solid;
  const polygons = geometries.geom3.toPolygons(clean);
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
      positions[o++] = a[0]; positions[o++] = a[1]; positions[o++] = a[2];
      positions[o++] = b[0]; positions[o++] = b[1]; positions[o++] = b[2];
      positions[o++] = c[0]; positions[o++] = c[1]; positions[o++] = c[2];
    }
  }
  return { positions, triangles };
}

/** The triangles back as a JSCAD solid, for the file serializers. */
export function solidOfMesh(mesh: GeneratedMesh): Geom3 {
  const p = mesh.positions;
  const faces: [number, number, number][][] = [];
  for (let i = 0; i + 8 < p.length; i += 9) {
    faces.push([[p[i], p[i + 1], p[i + 2]], [p[i + 3], p[i + 4], p[i + 5]], [p[i + 6], p[i + 7], p[i + 8]]]);
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
