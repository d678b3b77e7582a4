/**
 * What the collision model covers, in the words shown beside every clearance figure and in the
 * exports (isomorphic).
 */
export const CELL_CAUTION =
  "The collision check is a model, not a safety function: it checks rigid capsules and primitives for the geometry entered here (links, base, tool, payload, obstacles) and nothing else: no cable packs, dress packs, hoses or people unless they are modelled. A free configuration and its clearance are no substitute for the maker's data, a risk assessment (ISO 12100, ISO 10218-2), the collaborative-operation limits of ISO/TS 15066 or local codes.";
