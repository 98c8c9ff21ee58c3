/*
 * emissivity.h — a surface's emissivity from a reference measurement.
 *
 * When the surface's true temperature T is known (a contact probe, or a
 * reference patch of known emissivity on the same surface read by the same
 * instrument), the measurement equation of measure.h
 *     S = tau [eps L(T) + (1 - eps) L_refl] + A
 * is solved for eps instead of T:
 *     eps = (S - A - tau L_refl) / (tau (L(T) - L_refl)).
 * This follows the reference-temperature (contact or known-emissivity patch)
 * procedures of the ASTM practice for measuring and compensating for
 * emissivity with infrared imaging radiometers (ASTM E1933).
 *
 * Sensitivities (with D = tau (L(T) - L_refl)), per unit of each input:
 *   d eps/dT     = -eps tau L'(T) / D
 *   d eps/dTapp  =  L'(T_app) / D          (1/D for a radiance signal)
 *   d eps/dTr    = -(1 - eps) tau L'(T_refl) / D   (-(1 - eps) tau / D)
 *   d eps/dtau   = (L_atm - L_refl - eps (L(T) - L_refl)) / D   (path form: without L_atm)
 *   d eps/dTa    = -(1 - tau) L'(T_atm) / D        (-1/D for a path radiance)
 *
 * Statuses: GB_ERR_EMISSIVITY_UNDETERMINED when L(T) = L_refl (the surface and
 * its surroundings look alike: no emissivity can be read); GB_ERR_EMISSIVITY_DOMAIN
 * when the result lies outside (0, 1] (inconsistent inputs).  The scene's own
 * emissivity field is ignored.  Accuracy: rounding of the band radiances
 * (<= 1e-13 relative) amplified by L/(L(T) - L_refl).
 */
#ifndef GREYBODY_EMISSIVITY_H
#define GREYBODY_EMISSIVITY_H

#include "band.h"
#include "measure.h"
#include "status.h"

typedef enum gb_emissivity_input {
    GB_EMISSIVITY_BY_SURFACE_TEMPERATURE = 0,
    GB_EMISSIVITY_BY_SIGNAL,
    GB_EMISSIVITY_BY_REFLECTED,
    GB_EMISSIVITY_BY_TRANSMITTANCE,
    GB_EMISSIVITY_BY_ATMOSPHERE,
    GB_EMISSIVITY_INPUT_COUNT
} gb_emissivity_input;

typedef struct gb_emissivity_estimate {
    double emissivity;
    double partial[GB_EMISSIVITY_INPUT_COUNT]; /* d eps / d input */
    unsigned char defined[GB_EMISSIVITY_INPUT_COUNT];
} gb_emissivity_estimate;

/* `scene.emissivity` is not used (give 1). */
gb_status gb_emissivity_from_reference(const gb_band *band, const gb_scene *scene,
                                       double surface_temperature_k,
                                       gb_emissivity_estimate *estimate);

#endif
