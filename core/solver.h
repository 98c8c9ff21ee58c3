/*
 * solver.h (internal) — the one root finder of the core: the temperature at
 * which a quantity that rises with temperature reaches a target.
 *
 * The caller's model gives v(T), in a logarithmic form (ln L for a band
 * radiance, ln R for a two-colour ratio), and dv/dT.  The solver runs
 * Newton's method on g(u) = v(1/u) - target in u = 1/T: ln L is nearly linear
 * in 1/T at the Wien end and like -ln u at the Rayleigh-Jeans end, so Newton
 * converges in a few steps at both.  A bracket kept from every evaluation
 * catches any step that leaves it, and bisection in ln u takes over, so it
 * always converges within [GB_BAND_TEMPERATURE_MIN, GB_BAND_TEMPERATURE_MAX].
 * A model that cannot be evaluated at some T (its radiance underflows) must
 * return a status other than GB_OK there; the solver treats that T as too
 * cold.  Stops when a Newton step changes u by <= 1e-13 relative.
 */
#ifndef GREYBODY_SOLVER_H
#define GREYBODY_SOLVER_H

#include "status.h"

typedef gb_status (*gb_rising_model)(const void *context, double temperature_k, double *value,
                                     double *slope_per_k);

/*
 * GB_ERR_RADIANCE_OUT_OF_RANGE when the target lies beyond v at either end of
 * the range; *slope_at_solution (may be NULL) receives dv/dT at the answer.
 */
gb_status gb_solve_rising(gb_rising_model model, const void *context, double target,
                          double first_guess_k, double *temperature_k,
                          double *slope_at_solution);

#endif
