// "Print the fit test first": for a part whose fit depends on critical dimensions, what printing the
// quick fit-test recipe before the durable set-ready one costs, and what it saves when the fit is off.
import { estimatePrint, type PartGeometry, type PrintEstimate, type PrintSettings } from './estimate';

export interface FitTestRecipe extends PrintSettings {
  purpose: 'fit-test' | 'set-ready';
}

export interface FitTestAdvice {
  fitTest: PrintEstimate;
  setReady: PrintEstimate;
  /** Time and filament a wrong fit would have wasted on the set-ready print, less the fit test's own. */
  savedMinIfWrong: number;
  savedGIfWrong: number;
  /** The fit test's time as a share of the set-ready print's (0.25 = a quarter). */
  timeShare: number;
}

/**
 * Compares the part's first fit-test recipe with its first set-ready one on the same model.
 * Null when the part lacks either recipe or has no key dimensions to check.
 */
export function fitTestAdvice(geometry: PartGeometry, recipes: readonly FitTestRecipe[], keyDimensions: number): FitTestAdvice | null {
  const fit = recipes.find((r) => r.purpose === 'fit-test');
  const set = recipes.find((r) => r.purpose === 'set-ready');
  if (!fit || !set || keyDimensions === 0) return null;
  const fitTest = estimatePrint(geometry, fit);
  const setReady = estimatePrint(geometry, set);
  return {
    fitTest,
    setReady,
    // if the fit is wrong, the set-ready print would have been thrown away; the fit test is what it cost to know
    savedMinIfWrong: setReady.timeMin - fitTest.timeMin,
    savedGIfWrong: setReady.massG - fitTest.massG,
    timeShare: setReady.timeMin > 0 ? fitTest.timeMin / setReady.timeMin : 0,
  };
}
