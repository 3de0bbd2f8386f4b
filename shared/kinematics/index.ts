/** Corner and axle kinematics: public library API (see docs/kinematics.md). */
export { exampleCorners, type ExampleCornerName } from './examples.js';
