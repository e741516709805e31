// Whether a shelf part suits a member's camera build: fits / may fit / not for this build, with the
// reasons a crew member would check by hand. Pure: the server marks search results with it and the
// client can explain a verdict without asking again.
//
// The rule, one question at a time:
//   body   – the part lists the build's body (+), lists no body at all (body-agnostic, neutral), or
//            lists only other bodies (−). A build without a body gives no evidence either way.
//   mounts – the part shares at least one mount standard with the build (+), or declares mounts and
//            none of them is on the build (−: it has nothing to attach to). No mounts declared on
//            either side gives no evidence.
//   sizes  – each key size of the build is compared with the part's key dimensions of the same name
//            (sameSizeName: "lens barrel" meets "barrel bore", not "rod bore"). The part's value ± its own
//            tolerance must overlap the build's value ± its tolerance, edges included (+); ranges
//            apart are a clash (−). Sizes the part does not name give no evidence.
// Verdict: any (−) → "not"; otherwise the body is listed, or a mount is shared, → "fits";
// otherwise (nothing known against it, nothing for it) → "may-fit".
//
// Worked example (tests/unit/build-fit.test.ts): build "A-camera, car week" = Korvel KX-8, 15 mm
// LWS rods + 1/4-20, lens barrel 80 ± 0.5 mm. The receiver cradle (KX-8, rods 15/60, 1/4-20) fits:
// body listed, two mounts shared. The lens gear ring (no body, 0.8 module gear, barrel bore 80.4 ±
// 0.3) has no mount in common with the build → not. A cold-shoe cover for the P1 only → not.

export type FitVerdict = 'fits' | 'may-fit' | 'not';

export interface FitSize {
  name: string;
  valueMm: number;
  tolMm: number;
}

export interface FitBuild {
  /** Body slug, or null for a build that names no body. */
  body: string | null;
  mounts: readonly string[];
  keySizes: readonly FitSize[];
}

export interface FitPart {
  bodies: readonly string[];
  mounts: readonly string[];
  keyDimensions: readonly FitSize[];
}

export type FitReasonKind =
  'body-listed' | 'body-agnostic' | 'body-other' | 'body-unknown' | 'mounts-shared' | 'mounts-none-shared' | 'mounts-unknown' | 'size-within' | 'size-clash';

export interface FitReason {
  kind: FitReasonKind;
  /** +1 speaks for the part, −1 against, 0 says nothing either way. */
  weight: -1 | 0 | 1;
  text: string;
}

export interface FitResult {
  verdict: FitVerdict;
  reasons: FitReason[];
  /** The one line to show on a result card. */
  summary: string;
}

/** Sort key: fits first, then may fit, then not. */
export const FIT_ORDER: Record<FitVerdict, number> = { fits: 0, 'may-fit': 1, not: 2 };

export const FIT_LABELS: Record<FitVerdict, string> = { fits: 'Fits your build', 'may-fit': 'May fit', not: 'Not for this build' };

// compared in nanometres, so 80.4 − 0.3 and 80 + 0.1 meet exactly where they should
const nm = (mm: number) => Math.round(mm * 1e6);

/** Two values with tolerances overlap when their distance is at most the sum of the tolerances. */
export function rangesOverlap(a: FitSize, b: FitSize): boolean {
  return Math.abs(nm(a.valueMm) - nm(b.valueMm)) <= nm(a.tolMm) + nm(b.tolMm);
}

const plainName = (name: string) => name.trim().replace(/\s+/g, ' ').toLowerCase();

// Words that say which measure of a thing a size is; a bore and a diameter measure the same way.
const MEASURES: Record<string, string> = {
  bore: 'diameter',
  diameter: 'diameter',
  dia: 'diameter',
  od: 'diameter',
  id: 'diameter',
  width: 'width',
  wide: 'width',
  height: 'height',
  tall: 'height',
  depth: 'depth',
  length: 'length',
  long: 'length',
  thickness: 'thickness',
  thick: 'thickness',
};

function nameParts(name: string) {
  const words = plainName(name)
    .split(/[^a-z0-9]+/)
    .filter(Boolean);
  const subject = new Set(words.filter((w) => !(w in MEASURES)).map((w) => w.replace(/s$/, '')));
  const measure = new Set(words.filter((w) => w in MEASURES).map((w) => MEASURES[w]));
  return { subject, measure };
}
const meets = (a: Set<string>, b: Set<string>) => [...a].some((x) => b.has(x));

/**
 * Whether two key-size names mean the same size: one name contains the other ("lens barrel" and
 * "lens barrel diameter"), or they name the same thing and do not measure it differently ("lens
 * barrel" and "barrel bore" meet; "plate width" and "plate height" do not, nor "rod bore" and
 * "barrel bore").
 */
export function sameSizeName(a: string, b: string): boolean {
  const x = plainName(a);
  const y = plainName(b);
  if (!x || !y) return false;
  if (x.includes(y) || y.includes(x)) return true;
  const p = nameParts(x);
  const q = nameParts(y);
  return meets(p.subject, q.subject) && (!p.measure.size || !q.measure.size || meets(p.measure, q.measure));
}

const mm = (v: number) => `${Number(v.toFixed(2))} mm`;
const sized = (s: FitSize) => (s.tolMm > 0 ? `${mm(s.valueMm).replace(' mm', '')} ± ${mm(s.tolMm)}` : mm(s.valueMm));

export interface FitLabels {
  body?: (slug: string) => string;
  mount?: (slug: string) => string;
}

export function fitPartToBuild(part: FitPart, build: FitBuild, labels: FitLabels = {}): FitResult {
  const bodyName = labels.body ?? ((s: string) => s);
  const mountName = labels.mount ?? ((s: string) => s);
  const reasons: FitReason[] = [];

  if (!part.bodies.length) reasons.push({ kind: 'body-agnostic', weight: 0, text: 'Not tied to a camera body' });
  else if (!build.body) reasons.push({ kind: 'body-unknown', weight: 0, text: 'The build names no body; the part lists some' });
  else if (part.bodies.includes(build.body)) reasons.push({ kind: 'body-listed', weight: 1, text: `Made for the ${bodyName(build.body)}` });
  else reasons.push({ kind: 'body-other', weight: -1, text: `Made for ${part.bodies.map(bodyName).join(', ')}, not the ${bodyName(build.body)}` });

  const shared = part.mounts.filter((m, i) => build.mounts.includes(m) && part.mounts.indexOf(m) === i);
  if (shared.length) reasons.push({ kind: 'mounts-shared', weight: 1, text: `Shares ${shared.map(mountName).join(', ')}` });
  else if (part.mounts.length && build.mounts.length) {
    reasons.push({
      kind: 'mounts-none-shared',
      weight: -1,
      text: `Needs ${[...new Set(part.mounts)].map(mountName).join(' or ')}, which the build does not have`,
    });
  } else reasons.push({ kind: 'mounts-unknown', weight: 0, text: part.mounts.length ? 'The build lists no mounts' : 'The part lists no mounts' });

  for (const size of build.keySizes) {
    const named = part.keyDimensions.filter((d) => sameSizeName(d.name, size.name));
    if (!named.length) continue;
    const within = named.find((d) => rangesOverlap(d, size));
    if (within) reasons.push({ kind: 'size-within', weight: 1, text: `${within.name} ${sized(within)} meets your ${size.name} ${sized(size)}` });
    else reasons.push({ kind: 'size-clash', weight: -1, text: `${named[0].name} ${sized(named[0])} misses your ${size.name} ${sized(size)}` });
  }

  const against = reasons.filter((r) => r.weight < 0);
  const verdict: FitVerdict = against.length ? 'not' : reasons.some((r) => r.kind === 'body-listed' || r.kind === 'mounts-shared') ? 'fits' : 'may-fit';
  const lead = verdict === 'not' ? against : reasons.filter((r) => r.weight > 0);
  const summary = (lead.length ? lead : reasons).map((r) => r.text).join(' · ');
  return { verdict, reasons, summary };
}
