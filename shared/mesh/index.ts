export { analyseModelFile, analyseTriangles, checkPrintableSize, MeshAccumulator, MM_PER_INCH, WELD_TOLERANCE_PER_DIAGONAL } from './analysis';
export { meshConcerns, type MeshSoundness } from './concerns';
export {
  declaredFacetCount,
  describeNonMeshBytes,
  detectStlFormat,
  isBinaryStlSize,
  parseStl,
  PositionCollector,
  readAsciiStl,
  readBinaryStl,
  readBinaryStlFacets,
  BINARY_STL_FACET_BYTES,
  BINARY_STL_PREFIX_BYTES,
  type ParsedStl,
  type StlFormat,
} from './stl';
export { isZip, parse3mf, read3mf, THREEMF_UNIT_MM, type Parsed3mf, type Read3mfOptions, type ThreeMfModel, type ThreeMfUnit } from './threemf';
export * from './types';
