/** Handling intent → tie-rod heights: public library API (see docs/intent.md). */
export { solveIntent, rackPositions, understeerChange, TARGET_TOL, type SolveResult, type StaticToeReset, type SideEffects, type FamilyMemberOut, type RackFit, type CoordinateChange, type Progress } from './solve.js';
export { computeSolve, computeProposalDetails } from './api.js';
export { proposalDetails, type ProposalDetails } from './member.js';
export { workshopNumbers, asBuiltCorner, shimCount, linkName, type WorkshopNumbers, type ShimStack } from './workshop.js';
export { applyCoordinates, readCoordinates } from './coordinates.js';
export { solveFamily, type FamilyOutcome, type FamilyProblem, type LimitingBound } from './optimise.js';
