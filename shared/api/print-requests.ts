// What the print-request routes answer.
import type { PrintPrice } from '../print-price';
import type { PaymentState, PrintRequestAction, PrintRequestState } from '../print-requests';

export interface PrintRequestPerson {
  id: number;
  displayName: string;
}

export interface PrintRequestStep {
  action: string;
  from: string | null;
  to: string | null;
  /** Null when the payments service did it. */
  actor: PrintRequestPerson | null;
  note: string | null;
  at: string;
}

export interface PrintRequestInfo {
  id: number;
  kind: 'part' | 'kit';
  title: string;
  part: { id: number; slug: string } | null;
  kitId: number | null;
  quantity: number;
  material: string;
  neededBy: string | null;
  note: string | null;
  crew: { id: number; name: string } | null;
  printer: { id: number | null; name: string; watts: number | null };
  requester: PrintRequestPerson;
  owner: PrintRequestPerson;
  status: PrintRequestState;
  /** The viewer's side of the request. */
  role: 'owner' | 'requester';
  actions: PrintRequestAction[];
  estimate: { grams: number; minutes: number; filament: { material: string; grams: number }[]; notes: string[] };
  /** Live from the owner's prices until they accept; frozen from then on. */
  price: PrintPrice;
  priceFrozen: boolean;
  payment: { status: PaymentState; paidMinor: number; paidAt: string | null; refundedAt: string | null; canPay: boolean };
  createdAt: string;
  updatedAt: string;
}

export interface PrintRequestDetail extends PrintRequestInfo {
  history: PrintRequestStep[];
}

export interface MoneyByCurrency {
  currency: string;
  minor: number;
}

export interface PrintRequestList {
  /** Requests for the viewer's printers. */
  forMe: PrintRequestInfo[];
  /** Requests the viewer made. */
  mine: PrintRequestInfo[];
  totals: {
    /** Owed to the viewer as a printer owner (accepted, not yet paid). */
    owedToMe: MoneyByCurrency[];
    /** Paid to the viewer as a printer owner (refunds taken off). */
    paidToMe: MoneyByCurrency[];
    /** What the viewer paid as a requester (refunds taken off). */
    iPaid: MoneyByCurrency[];
  };
}

export interface CrewPrinter {
  id: number;
  name: string;
  watts: number | null;
  nozzleMm: number;
  bedMm: [number, number, number];
  owner: PrintRequestPerson;
  crew: { id: number; name: string; currency: string };
}
