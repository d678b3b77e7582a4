/**
 * What the cycle-time figures are and are not, in the words shown beside every cycle time
 * (isomorphic; the model's limits are in docs/design.md#cycle-time).
 */
export const CYCLE_CAUTION =
  "A cycle time here compares the arms with one another under one simple model; it is not a promise of what the cell will do. The model leaves out blending between moves, the effect of the payload on how fast a joint can accelerate, jerk limits, settling and signal exchange, and the speed limits a controller or a safety function imposes (for example the reduced speed of collaborative operation). Rely on the maker's cycle data and a trial in the cell, and on a risk assessment per ISO 10218 and ISO/TS 15066, not on this figure.";
