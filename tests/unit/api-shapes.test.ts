// The client reads the API through the interfaces in shared/api/parts.ts; these checks fail the
// typecheck (npm run typecheck) when the server's presenter stops matching them.
import { describe, expect, expectTypeOf, it } from 'vitest';
import type { PartDetail } from '@shared/api/parts';
import type { PartDetail as PresentedPart } from '../../server/modules/parts/presenter';

describe('api shapes · part detail', () => {
  it('api shapes · what the presenter answers · fits what the client reads', () => {
    expectTypeOf<PresentedPart>().toExtend<PartDetail>();
    expect(true).toBe(true);
  });
});
