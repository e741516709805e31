import { describe, expect, it } from 'vitest';
import { analyseModelFile, MeshError } from '../../shared/mesh/index';
import { MODEL_LIMITS } from '../../shared/uploads';
import { boxStl, cubeStl } from '../helpers/meshes';

function refusal(bytes: Uint8Array, options: Parameters<typeof analyseModelFile>[1] = {}): MeshError {
  try {
    analyseModelFile(bytes, options);
  } catch (err) {
    if (err instanceof MeshError) return err;
    throw err;
  }
  throw new Error('the mesh was accepted');
}

describe('mesh limits · a part no printer can build', () => {
  it('mesh limits · a cube with 3e38 mm sides (float32 allows up to 3.4e38) · refused as implausible, not measured', () => {
    const err = refusal(cubeStl(3e38));
    expect(err.code).toBe('implausible_size');
    expect(err.message).toMatch(/3\.00e\+38 × 3\.00e\+38 × 3\.00e\+38 mm/);
  });

  // STL stores float32, about 7 significant digits: 1999 mm comes back within a few µm
  it(`mesh limits · any one side · at most ${MODEL_LIMITS.maxExtentMm} mm`, () => {
    expect(analyseModelFile(boxStl(1999, 10, 10)).sizeMm[0]).toBeCloseTo(1999, 1);
    expect(refusal(boxStl(10, 10, 2001)).code).toBe('implausible_size');
  });

  it('mesh limits · 80 units in inches (80 × 25.4 = 2,032 mm, NIST SP 811 Appendix B) · the limit applies after the scale', () => {
    expect(analyseModelFile(boxStl(78, 10, 10), { drawnInInches: true }).sizeMm[0]).toBeCloseTo(1981.2, 1);
    expect(refusal(boxStl(80, 10, 10), { drawnInInches: true }).message).toMatch(/do not mark it as drawn in inches/);
  });
});
