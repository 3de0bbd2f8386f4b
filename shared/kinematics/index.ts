/**
 * Corner and axle kinematics: public library API (see docs/kinematics.md).
 * Conventions (axes, signs, units) are those of shared/docs/domain.md.
 */
export { exampleCorners } from './examples.js';
export { compileCorner, moveCornerPoints, type CornerModel, type CornerMoves, type Side } from './model.js';
export { CornerSolver, RESIDUAL_TOL_MM, type SolveDiagnostics } from './solver.js';
export { poseOutputs, poseRow, wheelStateInto, WHEEL_TOE, WHEEL_CAMBER, WHEEL_TOE_GRADIENT, WHEEL_CAMBER_GRADIENT, WHEEL_CP, kingpinAxis, type PoseResult, type PoseRow, type KingpinAxis } from './pose.js';
export {
  solvePose,
  posedPoints,
  posedHardpoints,
  sweepCorner,
  sweepTravels,
  expandRange,
  checkRack,
  MAX_SWEEP_POINTS,
  type PoseState,
  type Range,
  type SweepOptions,
  type SweepResult,
  type SweepRow,
  type SweepFit,
} from './sweep.js';
export { polyFit, fitToeCamber, type ToeFit } from './fit.js';
export {
  axleSides,
  axleKinematics,
  axleSummary,
  rollSweep,
  rollSteerCoefficient,
  rackForAxleSteer,
  ackermannPercent,
  frontViewIc,
  frontViewIcInto,
  sideViewIc,
  rollCentreOf,
  rollCentreHeightOf,
  rightCornerToLeftFrame,
  type AxleSides,
  type AxleSummary,
  type AxleKinematicsOptions,
  type AntiOptions,
  type RollRow,
  type RollRackSummary,
  type RollSweepOptions,
  type SteeringRow,
  type FrontViewIc,
  type SideViewIc,
} from './axle.js';
