/**
 * The app's path to the one number formatter, which lives in shared/ so that
 * the server's exports and the review record write numbers as the screens do.
 */
export { formatNum, type NumFormat } from '../../../../shared/units/format';
