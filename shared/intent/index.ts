/** Handling intent → tie-rod heights: public library API (see docs/intent.md). */
export { solveIntent, rackPositions, understeerChange, TARGET_TOL, type SolveResult, type SideEffects, type FamilyMemberOut, type RackFit, type CoordinateChange, type Progress } from './solve.js';
export { computeSolve } from './api.js';
export { cautionsForCorner, measureCornerCautions, cautionRackPositions, type CornerCautionOptions } from './corner-cautions.js';
export { evaluateCautions, levelFor, thresholdsFor, CAUTION_RULES, CAUTION_CODES, SAFETY_CAUTION, type Caution, type CautionCode, type CautionInputs, type CautionLevel, type CautionThresholds } from './cautions.js';
export { trackProfiles, resolveTrackProfile, TRACK_PROFILE_IDS, DEFAULT_TRACK_PROFILE, type TrackProfile, type TrackProfileId } from './profiles.js';
export { workshopNumbers, asBuiltCorner, shimCount, type WorkshopNumbers, type ShimStack } from './workshop.js';
export { applyCoordinates, readCoordinates } from './coordinates.js';
export { solveFamily, type FamilyOutcome, type FamilyProblem, type LimitingBound } from './optimise.js';
