// Short phrases for what is wrong with a mesh, for lists where a moderator or a crew reads many
// files at once (the review desk, kit notes). The analysis's own warnings are the long versions.

/** The fields of an analysis these phrases read; older stored analyses may lack the newer ones. */
export interface MeshSoundness {
  watertight: boolean;
  insideOut: boolean;
  shells: number;
  openEdges?: number;
  nonManifoldEdges?: number;
  reversedFacets?: number | null;
  insideOutShells?: number | null;
  degenerateFacets?: number;
  zeroAreaFacets?: number | null;
  volumeRepaired?: boolean | null;
}

const plural = (n: number, one: string, many: string) => `${n.toLocaleString('en-US')} ${n === 1 ? one : many}`;

export function meshConcerns(a: MeshSoundness): string[] {
  const concerns: string[] = [];
  if (!a.watertight) {
    const why: string[] = [];
    if (a.openEdges) why.push(plural(a.openEdges, 'open edge', 'open edges'));
    if (a.nonManifoldEdges) why.push(plural(a.nonManifoldEdges, 'edge shared by more than two facets', 'edges shared by more than two facets'));
    concerns.push(why.length ? `not watertight (${why.join(', ')})` : 'not watertight');
  }
  if (a.reversedFacets) concerns.push(`${plural(a.reversedFacets, 'facet', 'facets')} wound backwards`);
  if (a.insideOutShells && a.insideOutShells < a.shells) concerns.push(`${a.insideOutShells} of ${a.shells} shells inside out`);
  else if (a.insideOut) concerns.push('facets wound inside out');
  if (a.volumeRepaired) concerns.push('volume counted with the wrongly wound facets flipped');
  const zeroArea = (a.degenerateFacets ?? 0) + (a.zeroAreaFacets ?? 0);
  if (zeroArea) concerns.push(`${plural(zeroArea, 'zero-area facet', 'zero-area facets')}`);
  return concerns;
}
