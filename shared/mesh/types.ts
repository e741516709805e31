// Shared by the server (upload checks) and the browser (preview before upload):
// nothing in shared/mesh may depend on Node-only APIs.

export type Vec3 = [number, number, number];

/** Figures for one triangle mesh. Lengths in mm, areas in mm², volumes in mm³. */
export interface MeshAnalysis {
  /** Bounding-box extents along x, y and z. */
  sizeMm: Vec3;
  min: Vec3;
  max: Vec3;
  /**
   * Enclosed volume of the mesh with its winding made consistent: facets wound against the rest of
   * their shell, and shells wound inside out, count as if flipped (`volumeRepaired` says when that
   * changed anything). Only meaningful when the mesh is watertight.
   */
  volumeMm3: number;
  /** Σ v1·(v2×v3)/6 over all facets as wound in the file; negative when they are wound inside out. */
  signedVolumeMm3: number;
  /** True when `volumeMm3` counts reversed facets, or some but not all shells, as flipped. */
  volumeRepaired: boolean;
  /** Some shell encloses negative volume (and is not a cavity inside another shell). */
  insideOut: boolean;
  /** Shells wound inside out as a whole. */
  insideOutShells: number;
  /** Every edge shared by two facets is used once in each direction, and each shell can be oriented. */
  windingConsistent: boolean;
  /** Facets wound against the majority of their shell (the ones a repair flips). */
  reversedFacets: number;
  /** Edges whose two facets run along them in the same direction. */
  misorientedEdges: number;
  areaMm2: number;
  facets: number;
  /** Facets with a repeated corner (two corners weld to one vertex); they have zero area. */
  degenerateFacets: number;
  /** Facets with three distinct corners in a line: zero area too. */
  zeroAreaFacets: number;
  /** Every edge (between welded vertices, ignoring zero-area facets) is shared by exactly two facets. */
  watertight: boolean;
  /** Edges used by only one facet: the rims of holes. */
  openEdges: number;
  /** Edges shared by three or more facets. */
  nonManifoldEdges: number;
  /** Connected pieces (facets joined through shared vertices). */
  shells: number;
  /** Distinct vertices after welding. */
  vertices: number;
  /**
   * Vertices closer than `weldToleranceMm` to another, merged before the final edge checks (exact
   * duplicates not counted). Only tried when exact welding leaves open edges.
   */
  weldedVertices: number;
  /** Welding tolerance: a millionth of the bounding-box diagonal. */
  weldToleranceMm: number;
  /** Plain sentences for the contributor; empty when nothing looks wrong. */
  warnings: string[];
}

export type ModelFormat = 'stl-binary' | 'stl-ascii' | '3mf';

export interface ModelFileAnalysis extends MeshAnalysis {
  format: ModelFormat;
  /** Millimetres per file unit that were applied (1 for plain STL, 25.4 for inches). */
  unitScale: number;
}

export interface AnalyseOptions {
  /** Millimetres per unit of the positions; results are scaled by it. Default 1. */
  unitScale?: number;
}

export interface AnalyseFileOptions {
  /** Auto-detected when omitted: a ZIP signature means 3MF, anything else STL. */
  format?: 'stl' | '3mf';
  /** STL carries no unit; set this when the part was drawn in inches (scales by exactly 25.4). Ignored for 3MF, which declares its unit. */
  drawnInInches?: boolean;
  /** 3MF only: refuse archives whose entries would inflate beyond this many bytes. Default MODEL_LIMITS.maxUnpackedBytes. */
  maxUncompressedBytes?: number;
  /** 3MF only: refuse builds that expand beyond this many triangles. Default MODEL_LIMITS.maxTriangles. */
  maxTriangles?: number;
}

/** Receives triangles one at a time, so readers need not build a position array. */
export interface FacetSink {
  addFacet(ax: number, ay: number, az: number, bx: number, by: number, bz: number, cx: number, cy: number, cz: number): void;
}

export type MeshErrorCode =
  | 'empty'
  | 'not_a_mesh'
  | 'too_short'
  | 'truncated'
  | 'count_mismatch'
  | 'ascii_syntax'
  | 'non_finite'
  | 'no_facets'
  | 'bad_input'
  | 'not_zip'
  | 'bad_zip'
  | 'zip_bomb'
  | 'no_model'
  | 'bad_unit'
  | 'bad_number'
  | 'bad_transform'
  | 'index_out_of_range'
  | 'unknown_object'
  | 'component_cycle'
  | 'too_large'
  | 'too_deep'
  | 'implausible_size'
  | 'no_triangles';

/** A file that cannot be analysed; `message` is written for the contributor who uploaded it. */
export class MeshError extends Error {
  readonly code: MeshErrorCode;

  constructor(code: MeshErrorCode, message: string) {
    super(message);
    this.name = 'MeshError';
    this.code = code;
  }
}
