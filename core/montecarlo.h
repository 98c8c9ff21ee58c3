/*
 * montecarlo.h — propagation of distributions through the measurement
 * equation by Monte Carlo (JCGM 101:2008, "Supplement 1 to the GUM").
 *
 * Each input of the scene (emissivity, reflected, transmittance, atmosphere,
 * signal; indexed by gb_input of uncertainty.h) gets a distribution centred
 * on its value: normal with the given standard uncertainty, or rectangular
 * with half-width sqrt(3) u (same standard uncertainty), or none (held
 * fixed).  Draws that leave an input's physical domain (emissivity or
 * transmittance outside (0, 1], a temperature <= 0 K, a negative radiance)
 * are redrawn: the distributions are truncated to the domain, as the
 * knowledge they encode requires (JCGM 101 6.4.1).  A draw whose surface
 * signal is not positive has no solution and is counted, not used.
 *
 * Output: mean, standard deviation (n - 1), and the probabilistically
 * symmetric 95 % coverage interval (the 2.5 % and 97.5 % quantiles of the
 * sorted results, JCGM 101 7.7).  Pseudo-random numbers: xoshiro256**
 * (Blackman & Vigna, 2018) seeded through splitmix64, so a seed gives the
 * same answer on every machine; normal deviates by the Box-Muller transform.
 * The caller provides `workspace` of `draws` doubles; nothing is allocated.
 *
 * Statuses beyond the scene's own: GB_ERR_DRAW_COUNT (draws outside
 * [GB_MONTE_CARLO_MIN_DRAWS, GB_MONTE_CARLO_MAX_DRAWS]);
 * GB_ERR_DISTRIBUTION_UNKNOWN; GB_ERR_UNCERTAINTY_DOMAIN (u < 0, or an input
 * whose distribution never lands in its domain in 1000 tries);
 * GB_ERR_INVALID_ARGUMENT when transmittance or atmosphere is to be varied but
 * the atmosphere temperature is absent (NaN with tau = 1);
 * GB_ERR_NET_SIGNAL_NOT_POSITIVE when fewer than GB_MONTE_CARLO_MIN_DRAWS
 * draws had a solution.
 */
#ifndef GREYBODY_MONTECARLO_H
#define GREYBODY_MONTECARLO_H

#include <stddef.h>
#include <stdint.h>

#include "band.h"
#include "measure.h"
#include "status.h"
#include "uncertainty.h"

#define GB_MONTE_CARLO_MIN_DRAWS 100
#define GB_MONTE_CARLO_MAX_DRAWS 1000000
#define GB_MONTE_CARLO_COVERAGE 0.95

typedef enum gb_distribution {
    GB_DISTRIBUTION_NONE = 0,
    GB_DISTRIBUTION_NORMAL,
    GB_DISTRIBUTION_RECTANGULAR
} gb_distribution;

typedef struct gb_monte_carlo_input {
    gb_distribution distribution[GB_INPUT_COUNT];
    double standard_uncertainty[GB_INPUT_COUNT];
} gb_monte_carlo_input;

typedef struct gb_monte_carlo_result {
    double mean_k;
    double standard_deviation_k;
    double coverage_low_k;   /* 2.5 % quantile */
    double coverage_high_k;  /* 97.5 % quantile */
    size_t used_draws;       /* draws with a solution */
    size_t unsolvable_draws; /* draws with no solution: net surface signal not positive,
                                or a temperature outside the band solver's range */
} gb_monte_carlo_result;

gb_status gb_monte_carlo(const gb_band *band, const gb_scene *scene,
                         const gb_monte_carlo_input *input, size_t draws, uint64_t seed,
                         double *workspace, gb_monte_carlo_result *result);

#endif
