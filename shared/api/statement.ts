// A kit's statement for the production office (GET /api/kits/:id/statement, .csv and .pdf).
import type { StatementFigures } from '../statement';

export interface StatementInfo extends StatementFigures {
  kit: { id: number; name: string; production: string | null; startsOn: string | null; endsOn: string | null };
  crew: { id: number; name: string; production: string | null };
  purchaseOrder: string | null;
  fees: { label: string; amount: number }[];
  /** YYYY-MM-DD */
  issuedOn: string;
}
