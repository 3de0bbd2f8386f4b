/** Constants shared by the balance model (domain.md). */

/** Standard gravity, m/s² (domain.md: g = 9.80665). */
export const G = 9.80665;
/** m/s per km/h. */
export const KPH = 1 / 3.6;
