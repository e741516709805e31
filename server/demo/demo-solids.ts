// Solid models for the demo shelf, built with a CAD library (@jscad/modeling) from 2D outlines
// extruded and combined, then written as binary STL. Sizes follow the trade conventions the parts
// name (15 and 19 mm rods, 1/4-20 clearance, module 0.8 teeth); they are shapes to look at and to
// estimate from, not drawings to print a rig from.
import jscad from '@jscad/modeling';
import { toBinaryStl } from './demo-meshes';

const { primitives, booleans, extrusions, transforms, geometries, modifiers } = jscad;
type Geom2 = ReturnType<typeof primitives.rectangle>;
type Geom3 = ReturnType<typeof primitives.cuboid>;
type Tri = [number, number, number, number, number, number, number, number, number];

const SEGMENTS = 40;
/** Clearance holes: 1/4-20 and 3/8-16 screws (common practice: nominal diameter + about 0.5 mm). */
export const HOLE_1_4 = 6.9;
export const HOLE_3_8 = 10;

const circle = (d: number, at: [number, number] = [0, 0]) => primitives.circle({ radius: d / 2, center: at, segments: SEGMENTS });
const rect = (w: number, h: number, at: [number, number] = [0, 0]) => primitives.rectangle({ size: [w, h], center: at });
const rounded = (w: number, h: number, r: number, at: [number, number] = [0, 0]) =>
  primitives.roundedRectangle({ size: [w, h], roundRadius: Math.min(r, w / 2 - 0.01, h / 2 - 0.01), center: at, segments: 16 });
const up = (h: number, shape: Geom2) => extrusions.extrudeLinear({ height: h }, shape);
const lift = (z: number, g: Geom3) => transforms.translate([0, 0, z], g);

/** Closed triangles as binary STL, T-junctions mended so every edge is shared by two facets. */
export function solidStl(geom: Geom3, name: string): Buffer {
  // the package's typings declare a default export where the runtime has the function itself
  const generalize = modifiers.generalize as unknown as (options: { snap?: boolean; triangulate?: boolean }, g: Geom3) => Geom3;
  const clean = generalize({ snap: true, triangulate: true }, geom);
  const tris: Tri[] = [];
  for (const polygon of geometries.geom3.toPolygons(clean)) {
    const v = polygon.vertices;
    for (let i = 1; i + 1 < v.length; i++) tris.push([...v[0], ...v[i], ...v[i + 1]] as Tri);
  }
  return toBinaryStl(tris, name);
}

/** A flat plate with screw holes along its length (cheese plates, spacers, risers). */
export function plate(x: number, y: number, t: number, holes: { d: number; at: [number, number] }[] = []): Geom3 {
  return up(t, booleans.subtract(rounded(x, y, 3), ...holes.map((h) => circle(h.d, h.at))));
}

/** A clamp block across one or two rods, slit to pinch; a pair has a mounting hole down through the bridge. */
export function rodClamp(rodD: number, centres: number | null, width: number, hole = HOLE_1_4): Geom3 {
  const span = (centres ?? 0) + rodD + 12;
  const height = rodD + 10;
  const bores = centres ? [-centres / 2, centres / 2] : [0];
  const side = booleans.subtract(
    rounded(span, height, 3, [0, height / 2]),
    ...bores.map((x) => circle(rodD + 0.3, [x, height / 2])),
    ...bores.map((x) => rect(1.5, height / 2, [x, height - height / 4 + 0.01])),
  );
  // the profile stands up (XZ) and is extruded through Y
  const body = transforms.translate([0, width / 2, 0], transforms.rotateX(Math.PI / 2, up(width, side)));
  if (!centres) return body;
  return booleans.subtract(body, transforms.translate([0, 0, -1], up(height + 2, circle(hole))));
}

/** A follow-focus gear ring: `teeth` at module `m`, with a bore for the lens barrel. */
export function gearRing(bore: number, teeth: number, m: number, width: number): Geom3 {
  const pitchR = (m * teeth) / 2;
  const outerR = pitchR + m;
  const rootR = pitchR - 1.25 * m;
  const points: [number, number][] = [];
  for (let i = 0; i < teeth; i++) {
    const a = (2 * Math.PI * i) / teeth;
    const step = (2 * Math.PI) / teeth;
    // a trapezoid tooth: root, flank, tip, flank
    for (const [f, r] of [
      [0, rootR],
      [0.2, rootR],
      [0.35, outerR],
      [0.65, outerR],
      [0.8, rootR],
    ] as const) {
      points.push([r * Math.cos(a + f * step), r * Math.sin(a + f * step)]);
    }
  }
  const outline = primitives.polygon({ points });
  return up(width, booleans.subtract(outline, primitives.circle({ radius: bore / 2, segments: 96 })));
}

/** A ring or tube: washers, spacers, port caps without their top. */
export function tube(outer: number, inner: number, h: number): Geom3 {
  return up(h, booleans.subtract(primitives.circle({ radius: outer / 2, segments: 64 }), primitives.circle({ radius: inner / 2, segments: 64 })));
}

/** A cap: a closed disc with a skirt that slips over a barrel or a port (its section turned round the axis). */
export function cap(inner: number, wall: number, depth: number, top = 2): Geom3 {
  const r = inner / 2;
  const section = primitives.polygon({
    points: [
      [0, 0],
      [r + wall, 0],
      [r + wall, depth + top],
      [r, depth + top],
      [r, top],
      [0, top],
    ],
  });
  return extrusions.extrudeRotate({ segments: 64 }, section);
}

/** An accessory-shoe foot (ISO 518 nominal: about 18.6 mm wide, 2 mm thick) under a square base. */
export function shoeFoot(baseW: number, baseH: number, hole = HOLE_1_4): Geom3 {
  const foot = up(2, rect(18.6, 18, [0, 0]));
  const neck = lift(1.999, up(2.5, rect(12, 16)));
  const base = lift(4.498, up(baseH, booleans.subtract(rounded(baseW, Math.max(baseW, 20), 2), circle(hole))));
  return booleans.union(foot, neck, base);
}

/** A snap-on clip: an open ring round a rod or cable, optionally a second one beside it. */
export function clip(d: number, wall: number, h: number, cables = 1): Geom3 {
  const one = (x: number) =>
    booleans.subtract(
      primitives.circle({ radius: d / 2 + wall, center: [x, 0], segments: 48 }),
      primitives.circle({ radius: d / 2, center: [x, 0], segments: 48 }),
      rect(d * 0.8, d, [x, d / 2 + wall / 2]),
    );
  const shapes = Array.from({ length: cables }, (_, i) => one(i * (d + wall)));
  return up(
    h,
    cables > 1 ? booleans.union(...shapes, rect((cables - 1) * (d + wall), wall * 2, [((cables - 1) * (d + wall)) / 2, -d / 2 - wall / 2])) : shapes[0],
  );
}

/** A dovetail: a V-grooved bar of the given width across its flats, cut to length. */
export function dovetail(width: number, length: number, t = 8): Geom3 {
  const w = width / 2;
  const outline = primitives.polygon({
    points: [
      [-w + t * 0.6, 0],
      [w - t * 0.6, 0],
      [w, t],
      [-w, t],
    ],
  });
  return transforms.rotateX(Math.PI / 2, up(length, booleans.subtract(outline, circle(HOLE_1_4, [0, t / 2]))));
}

/** A rail clamp: a block with a channel across its underside (for a MIL-STD-1913 rail, 21.2 mm over the top). */
export function railClamp(length: number): Geom3 {
  const outline = booleans.subtract(
    rounded(32, 16, 2, [0, 8]),
    primitives.polygon({
      points: [
        [-11, -0.01],
        [11, -0.01],
        [10.6, 3],
        [8, 6],
        [-8, 6],
        [-10.6, 3],
      ],
    }),
  );
  return transforms.rotateX(Math.PI / 2, up(length, outline));
}

/** An L bracket: a foot and an upright, each with a screw hole. */
export function lBracket(width: number, foot: number, rise: number, t: number): Geom3 {
  const outline = booleans.union(rect(foot, t, [foot / 2, t / 2]), rect(t, rise, [t / 2, rise / 2]));
  return transforms.rotateX(Math.PI / 2, up(width, outline));
}

/** A case insert: a block with pockets (width, depth) in a row, 2 mm of floor under them. */
export function tray(x: number, y: number, h: number, pockets: [number, number][]): Geom3 {
  let cursor = -x / 2 + 4;
  const holes: Geom3[] = [];
  for (const [w, d] of pockets) {
    holes.push(lift(2, up(h, rounded(w, d, 2, [cursor + w / 2, 0]))));
    cursor += w + 3;
  }
  return booleans.subtract(up(h, rounded(x, y, 3)), ...holes);
}

/** A battery-plate adapter: a plate with slots for the plate's studs or wedges and two mounting holes. */
export function batteryPlate(x: number, y: number, t: number, slots: [number, number][]): Geom3 {
  return up(
    t,
    booleans.subtract(rounded(x, y, 5), ...slots.map(([sx, sy]) => rounded(6, 14, 2.9, [sx, sy])), circle(HOLE_1_4, [-x / 4, 0]), circle(HOLE_1_4, [x / 4, 0])),
  );
}
