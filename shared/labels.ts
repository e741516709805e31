// Label sheets for a kit's printed items. Sizes are the usual self-adhesive sheets (from memory, the
// common 21-up A4 and 30-up Letter layouts): label size, columns and rows, gaps, and the page margins
// that centre the grid on the page.

export type LabelPaper = 'a4' | 'letter';

export interface LabelSheet {
  paper: LabelPaper;
  /** CSS @page size keyword. */
  pageSize: 'A4' | 'letter';
  pageMm: [number, number];
  labelMm: [number, number];
  columns: number;
  rows: number;
  /** Horizontal and vertical gap between labels. */
  gapMm: [number, number];
  description: string;
}

function sheet(
  paper: LabelPaper,
  pageSize: LabelSheet['pageSize'],
  pageMm: [number, number],
  labelMm: [number, number],
  columns: number,
  rows: number,
  gapMm: [number, number],
  description: string,
): LabelSheet {
  return { paper, pageSize, pageMm, labelMm, columns, rows, gapMm, description };
}

export const LABEL_SHEETS: Record<LabelPaper, LabelSheet> = {
  a4: sheet('a4', 'A4', [210, 297], [63.5, 38.1], 3, 7, [2.5, 0], 'A4 · 21 labels, 63.5 × 38.1 mm'),
  letter: sheet('letter', 'letter', [215.9, 279.4], [66.675, 25.4], 3, 10, [3.175, 0], 'Letter · 30 labels, 2⅝ × 1 in'),
};

/** The page margins (top, left) in mm that centre the label grid on the sheet. */
export function sheetMargins(s: LabelSheet): { topMm: number; leftMm: number } {
  const width = s.columns * s.labelMm[0] + (s.columns - 1) * s.gapMm[0];
  const height = s.rows * s.labelMm[1] + (s.rows - 1) * s.gapMm[1];
  return { topMm: (s.pageMm[1] - height) / 2, leftMm: (s.pageMm[0] - width) / 2 };
}

export interface LabelItem {
  partSlug: string;
  partTitle: string;
  material: string | null;
  recipeId: number | null;
  quantity: number;
}

export interface Label {
  key: string;
  partSlug: string;
  partTitle: string;
  material: string | null;
  recipeId: number | null;
  /** 1-based: the n-th of `of` copies of the same item. */
  copy: number;
  of: number;
}

/** One label per printed piece, in kit order; split into pages of the sheet's size. */
export function labelPages(items: readonly LabelItem[], s: LabelSheet): Label[][] {
  const labels: Label[] = [];
  items.forEach((item, i) => {
    for (let n = 1; n <= item.quantity; n++) {
      labels.push({
        key: `${i}-${n}`,
        partSlug: item.partSlug,
        partTitle: item.partTitle,
        material: item.material,
        recipeId: item.recipeId,
        copy: n,
        of: item.quantity,
      });
    }
  });
  const perPage = s.columns * s.rows;
  const pages: Label[][] = [];
  for (let i = 0; i < labels.length; i += perPage) pages.push(labels.slice(i, i + perPage));
  return pages;
}

/** What a label's QR code opens: the part with its recipe and the report form, on this site. */
export function labelLink(origin: string, l: Pick<Label, 'partSlug' | 'recipeId'>): string {
  const url = new URL(`/parts/${encodeURIComponent(l.partSlug)}/on-set`, origin);
  if (l.recipeId) url.searchParams.set('recipe', String(l.recipeId));
  return url.toString();
}
