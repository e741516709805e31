// The client reads the evidence endpoints through the interfaces in shared/api/evidence.ts; these
// checks fail the typecheck (npm run typecheck) when the service stops matching them.
import { describe, expect, expectTypeOf, it } from 'vitest';
import type { CrewProfile, Evidence, FlaggedEntry, FlagResult, HideResult, PartRatings, RatingSaved, ReportFiled, SetReportList } from '@shared/api/evidence';
import type { EvidenceService } from '../../server/modules/evidence/service';

type Answer<K extends keyof EvidenceService> = Awaited<ReturnType<EvidenceService[K]>>;

describe('api shapes · evidence', () => {
  it('api shapes · what the evidence service answers · fits what the client reads', () => {
    expectTypeOf<Answer<'rate'>['rating']>().toExtend<RatingSaved>();
    expectTypeOf<Answer<'ratings'>>().toExtend<PartRatings>();
    expectTypeOf<Answer<'fileReport'>>().toExtend<ReportFiled>();
    expectTypeOf<Answer<'reports'>>().toExtend<SetReportList>();
    expectTypeOf<Answer<'proven'>>().toExtend<Evidence>();
    expectTypeOf<Answer<'flag'>>().toExtend<FlagResult>();
    expectTypeOf<Answer<'flagged'>[number]>().toExtend<FlaggedEntry>();
    expectTypeOf<Answer<'hide'>>().toExtend<HideResult>();
    expectTypeOf<Answer<'profile'>>().toExtend<CrewProfile>();
    expect(true).toBe(true);
  });
});
