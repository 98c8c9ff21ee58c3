/*
 * measure.h — the measurement equation of a radiometer: from what the
 * instrument saw to the surface's own temperature.
 *
 * With L the band radiance (band.h) the instrument's signal, expressed as a
 * band radiance, is
 *     S = tau [eps L(T) + (1 - eps) L_refl] + A,
 *     A = (1 - tau) L(T_atm)    when the atmosphere is given as a temperature,
 *     A = L_path                when it is given as a path radiance,
 * where L_refl = L(T_refl) or a reflected radiance given directly.  Solving for
 * L(T) and inverting the band gives T.  With the band GB_BAND_TOTAL this is
 * the broadband (sigma T^4) model.  The signal itself is an apparent
 * temperature (the reading of an instrument set to eps = 1, tau = 1:
 * S = L(T_app)) or a measured band radiance.  The radiance form with a path
 * radiance is the single-channel remote-sensing equation (downwelling
 * radiance as L_refl, upwelling path radiance as L_path).
 *
 * Temperatures in K, radiances in W m^-2 sr^-1 (band radiance units).
 * Domain: eps and tau in (0, 1]; temperatures in (0, 1e9] K; radiances >= 0
 * (the signal radiance > 0).  When tau = 1 an atmosphere temperature does not
 * change T; pass NaN for "not given" (then dT/dtau is reported undefined by
 * uncertainty.h), or a valid temperature, which is then checked and used for
 * dT/dtau.
 * Accuracy: that of the band inversion (<= 1e-12 relative in T) amplified by
 * the conditioning of the subtraction, which sensitivity() reports.
 */
#ifndef GREYBODY_MEASURE_H
#define GREYBODY_MEASURE_H

#include "band.h"
#include "status.h"

typedef enum gb_term_kind {
    GB_TERM_TEMPERATURE = 0, /* value in K */
    GB_TERM_RADIANCE         /* value in W m^-2 sr^-1 */
} gb_term_kind;

typedef struct gb_term {
    gb_term_kind kind;
    double value;
} gb_term;

typedef struct gb_scene {
    gb_term signal;    /* apparent temperature, or measured band radiance */
    double emissivity;
    gb_term reflected; /* reflected temperature, or reflected (downwelling) radiance */
    double transmittance;
    gb_term atmosphere; /* atmosphere temperature, or path (upwelling) radiance */
} gb_scene;

/* Every intermediate of one solution, for sensitivities and reports. */
typedef struct gb_measurement {
    double temperature_k;          /* the surface temperature T */
    double surface_radiance;       /* L(T) */
    double surface_derivative;     /* L'(T) */
    double signal_radiance;        /* S */
    double signal_derivative;      /* L'(T_app); 0 for a radiance signal */
    double reflected_radiance;     /* L_refl */
    double reflected_derivative;   /* L'(T_refl); 0 for a radiance term */
    double atmosphere_radiance;    /* L(T_atm), or L_path */
    double atmosphere_derivative;  /* L'(T_atm); 0 for a radiance term or tau = 1 */
    double atmosphere_part;        /* A: (1 - tau) L(T_atm), or L_path */
} gb_measurement;

/* Checks the scene alone (no band): emissivity, transmittance, each term. */
gb_status gb_scene_validate(const gb_scene *scene);

/*
 * Evaluates the known terms only (signal, reflected, atmosphere and A) into
 * `measurement`; the surface fields are left 0.  Used by solvers that take
 * the equation for another unknown.
 */
gb_status gb_measure_terms(const gb_band *band, const gb_scene *scene,
                           gb_measurement *measurement);

/* Solves the measurement equation for T.  GB_ERR_NET_SIGNAL_NOT_POSITIVE when L(T) <= 0. */
gb_status gb_measure_solve(const gb_band *band, const gb_scene *scene,
                           gb_measurement *measurement);

/* Convenience: only the temperature. */
gb_status gb_measure_temperature(const gb_band *band, const gb_scene *scene,
                                 double *temperature_k);

#endif
