// What changed between the published revision and the one under review, as lines a moderator reads.
import type { PartDetail } from '../parts/presenter';

export interface Change {
  field: string;
  label: string;
  before: string;
  after: string;
}

const yesNo = (v: boolean) => (v ? 'yes' : 'no');

const FIELDS: { field: string; label: string; show: (p: PartDetail) => string }[] = [
  { field: 'title', label: 'Title', show: (p) => p.title },
  { field: 'summary', label: 'Summary', show: (p) => p.summary },
  { field: 'description', label: 'Description', show: (p) => p.description },
  { field: 'category', label: 'Category', show: (p) => p.category.label },
  { field: 'licence', label: 'Licence', show: (p) => p.licence.id },
  { field: 'bodies', label: 'Camera bodies', show: (p) => p.compatibility.bodies.map((b) => `${b.maker} ${b.model}`).join(', ') },
  { field: 'mounts', label: 'Mount standards', show: (p) => p.compatibility.mounts.map((m) => (m.note ? `${m.label} (${m.note})` : m.label)).join(', ') },
  {
    field: 'keyDimensions',
    label: 'Key dimensions',
    show: (p) => p.compatibility.keyDimensions.map((d) => `${d.name} ${d.valueMm} ± ${d.tolMm} mm`).join('; '),
  },
  { field: 'safety.carriesLoad', label: 'Carries load', show: (p) => yesNo(p.safety.carriesLoad) },
  { field: 'safety.overhead', label: 'Used overhead', show: (p) => yesNo(p.safety.overhead) },
  { field: 'safety.vehicle', label: 'Used on a vehicle', show: (p) => yesNo(p.safety.vehicle) },
  { field: 'safety.heat', label: 'Exposed to heat or sun', show: (p) => yesNo(p.safety.heat) },
  { field: 'testedLoadKg', label: 'Tested load', show: (p) => (p.safety.testedLoadKg == null ? 'none given' : `${p.safety.testedLoadKg} kg`) },
  {
    field: 'recipes',
    label: 'Recipes',
    show: (p) =>
      p.recipes
        .map(
          (r) =>
            `${r.purpose} ${r.material}, ${r.nozzleMm} mm nozzle, ${r.layerMm} mm layers, ${r.walls} walls, ${r.infillPct} % ${r.infillPattern}, ${r.hotendC}/${r.bedC} °C`,
        )
        .join('\n'),
  },
  {
    field: 'files',
    label: 'Files',
    show: (p) =>
      p.files
        .map((f) => `${f.kind}: ${f.name}`)
        .sort()
        .join('\n'),
  },
];

export function diffParts(before: PartDetail, after: PartDetail): Change[] {
  return FIELDS.flatMap(({ field, label, show }) => {
    const a = show(before);
    const b = show(after);
    return a === b ? [] : [{ field, label, before: a, after: b }];
  });
}
