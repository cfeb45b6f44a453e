import { probabilityLarger } from '../choiceProbability';

const Z_MIN = -40;
const CELLS = 5120;
const STEP = 1 / 64; // cells of 1/64 in z = γ·gap: P(LL) changes by at most 1/256 across one
const INV_STEP = 64;
// P(LL) as computed is within a few units of 2^−53 of the exact logistic, which is increasing in z,
// and z's cell is found with a relative error near 1e−16; a margin of 1e−12 covers both many times
const MARGIN = 1e-12;

/**
 * Draws of "larger-later chosen" for one choice model, decided exactly as
 * `u < probabilityLarger(γ, ε, gap)` but mostly without evaluating the logistic: P(LL) is
 * tabulated once at the edges of cells of z = γ·gap, and since it increases with z, a uniform
 * draw below the cell's lower edge (less a margin) is LL and one at or above its upper edge
 * (plus the margin) is SS. Only a draw inside that narrow band, or a z outside the table, has
 * P(LL) computed. The decision, and so every simulated choice for a given seed, is the same.
 */
export class LargerChoice {
  private readonly below: Float64Array;
  private readonly above: Float64Array;

  constructor(
    private readonly gamma: number,
    private readonly lapse: number,
  ) {
    this.below = new Float64Array(CELLS + 1);
    this.above = new Float64Array(CELLS + 1);
    for (let j = 0; j <= CELLS; j++) {
      const p = probabilityLarger(1, lapse, Z_MIN + j * STEP);
      this.below[j] = p - MARGIN;
      this.above[j] = p + MARGIN;
    }
  }

  /** True when the draw u (uniform on [0, 1)) chooses larger-later for value gap `gap`. */
  larger(u: number, gap: number): boolean {
    const t = (this.gamma * gap - Z_MIN) * INV_STEP;
    if (t >= 0 && t < CELLS) {
      const j = t | 0;
      if (u < this.below[j]) return true;
      if (u >= this.above[j + 1]) return false;
    }
    return u < probabilityLarger(this.gamma, this.lapse, gap);
  }
}
