/*
 * uncertainty.h — how the corrected temperature of measure.h depends on its
 * inputs, and the uncertainty that follows.
 *
 * Sensitivities are the analytic partial derivatives of T with respect to
 * each input, obtained by differentiating the measurement equation
 * implicitly (with L' = dL/dT of the band):
 *   dT/deps  = (L_refl - L(T)) / (eps L'(T))
 *   dT/dTr   = -(1 - eps) L'(T_refl) / (eps L'(T))        (per K)
 *   dT/dLr   = -(1 - eps) / (eps L'(T))                   (radiance form)
 *   dT/dtau  = (L_atm - eps L(T) - (1 - eps) L_refl) / (tau eps L'(T))
 *              (path-radiance form: without the L_atm term)
 *   dT/dTa   = -(1 - tau) L'(T_atm) / (tau eps L'(T))      (per K)
 *   dT/dLp   = -1 / (tau eps L'(T))                       (path-radiance form)
 *   dT/dTapp = L'(T_app) / (tau eps L'(T))                 (per K)
 *   dT/dS    = 1 / (tau eps L'(T))                         (radiance signal)
 * Each derivative is per unit of the input as given: per kelvin for a
 * temperature term, per W m^-2 sr^-1 for a radiance term.
 *
 * Combined standard uncertainty for uncorrelated inputs, JCGM 100:2008 (GUM)
 * eq. (10): u_c^2 = sum_i (c_i u_i)^2; expanded uncertainty U = k u_c with
 * k = 2 (about 95 % coverage for a near-normal output, GUM 6.2-6.3).
 */
#ifndef GREYBODY_UNCERTAINTY_H
#define GREYBODY_UNCERTAINTY_H

#include "band.h"
#include "measure.h"
#include "status.h"

typedef enum gb_input {
    GB_INPUT_EMISSIVITY = 0,
    GB_INPUT_REFLECTED,
    GB_INPUT_TRANSMITTANCE,
    GB_INPUT_ATMOSPHERE,
    GB_INPUT_SIGNAL,
    GB_INPUT_COUNT
} gb_input;

/* Stable names: "emissivity", "reflected", "transmittance", "atmosphere", "signal". */
const char *gb_input_name(gb_input input);

typedef struct gb_sensitivity {
    double temperature_k;
    double partial[GB_INPUT_COUNT]; /* dT / d input, indexed by gb_input */
    /*
     * 0 where a partial cannot be known: dT/dtau when tau = 1 and no
     * atmosphere temperature was given (its value is then 0 and means nothing).
     */
    unsigned char defined[GB_INPUT_COUNT];
} gb_sensitivity;

gb_status gb_measure_sensitivity(const gb_band *band, const gb_scene *scene,
                                 gb_sensitivity *sensitivity);

#define GB_COVERAGE_FACTOR 2.0

typedef struct gb_budget {
    double standard_uncertainty[GB_INPUT_COUNT]; /* u_i as given */
    double contribution[GB_INPUT_COUNT];         /* |c_i| u_i, K */
    double combined_standard_uncertainty;        /* u_c, K */
    double expanded_uncertainty;                 /* k u_c, K */
    double coverage_factor;                      /* k = 2 */
} gb_budget;

/*
 * GUM budget from sensitivities and standard uncertainties (each >= 0,
 * finite).  GB_ERR_INVALID_ARGUMENT when an uncertainty > 0 is given for an
 * input whose partial is not defined.
 */
gb_status gb_gum_budget(const gb_sensitivity *sensitivity,
                        const double standard_uncertainty[GB_INPUT_COUNT], gb_budget *budget);

/*
 * The exact temperature error of a reading made with emissivity eps + delta
 * on a surface whose emissivity is eps: T(eps + delta) - T(eps), both solved
 * in full (not linearised).  GB_ERR_EMISSIVITY_DOMAIN when eps + delta is outside (0, 1].
 */
gb_status gb_emissivity_error(const gb_band *band, const gb_scene *scene, double delta,
                              double *temperature_error_k);

#endif
