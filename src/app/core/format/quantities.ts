/**
 * The app's path to the one quantity table, which lives in shared/ so that the
 * server's exports and the review record convert and round as the screens do.
 */
export { displayDecimals, fromDisplayUnits, inDisplayUnits, kindForUnit, QUANTITIES, unitLabel, type QuantityKind, type QuantityUnits } from '../../../../shared/units/quantities';
