// The correction planner: the arithmetic a rebuilder does between measuring and measuring again (shims, lateral
// adjustment, scraping, tailstock set-over, bearing running clearance). One method per file; see
// docs/correction-planner.md for the worked examples and sign conventions.
export {
  tiltCorrection,
  inclinationAfterPadMoves,
  padMovesOf,
  type CorrectionPlane,
  type TiltCorrection,
  type TiltCorrectionInput,
} from "./correction-tilt";
export { scrapingDepths, shimmedHeight, SCRAPING_LIMITS, type ScrapingInput, type ScrapingPad } from "./correction-scraping";
export { tailstockSetOver, taperFromOffset, type SetOverCorrection, type SetOverInput } from "./correction-setover";
export { nutAxialMovement, backOffAngleFor, endFloatCheck, BEARING_LIMITS, type EndFloatCheck } from "./correction-bearing";
