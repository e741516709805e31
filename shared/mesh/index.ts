export { analyseModelFile, analyseTriangles, MeshAccumulator, MM_PER_INCH } from './analysis';
export {
  declaredFacetCount,
  describeNonMeshBytes,
  detectStlFormat,
  isBinaryStlSize,
  parseStl,
  PositionCollector,
  readAsciiStl,
  readBinaryStl,
  type ParsedStl,
  type StlFormat,
} from './stl';
export { isZip, parse3mf, read3mf, THREEMF_UNIT_MM, type Parsed3mf, type Read3mfOptions, type ThreeMfModel, type ThreeMfUnit } from './threemf';
export * from './types';
