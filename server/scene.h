/*
 * scene.h — the inputs of the measurement equation (measure.h) as a request
 * gives them, shared by /v1/corrected-temperature, /v1/sensitivity and
 * /v1/emissivity:
 *   signal      apparent_temperature | measured_radiance   (required)
 *   emissivity  emissivity                                  (GB_SCENE_EMISSIVITY)
 *   reflected   reflected_temperature | reflected_radiance  (required)
 *   transmittance (default 1)
 *   atmosphere  atmosphere_temperature | path_radiance      (required when tau < 1)
 *   band (default 8-14 um), model "band" | "total"          (GB_SCENE_MODEL)
 *   temperature_unit
 * and the standard uncertainties u_<field> of each input, in the form of the
 * input given (u_reflected_radiance goes with reflected_radiance).
 *
 * An absent atmosphere (allowed only when every transmittance is 1) is built
 * as a fixed placeholder temperature: with tau = 1 its term (1 - tau) L(T_a)
 * vanishes, so any value gives the same temperature.  Callers that need
 * measure.h's "not given" (NaN) test atmosphere_form == GB_FORM_ABSENT.
 */
#ifndef GREYBODY_SCENE_H
#define GREYBODY_SCENE_H

#include <stdbool.h>
#include <stddef.h>

#include "measure.h"
#include "params.h"
#include "uncertainty.h"
#include "units.h"

typedef enum gb_term_form {
    GB_FORM_TEMPERATURE = 0,
    GB_FORM_RADIANCE = 1,
    GB_FORM_ABSENT = 2
} gb_term_form;

typedef enum gb_scene_model { GB_MODEL_BAND = 0, GB_MODEL_TOTAL = 1 } gb_scene_model;

/* What gb_scene_read() reads beyond the common inputs. */
#define GB_SCENE_EMISSIVITY 1u /* "emissivity", required */
#define GB_SCENE_MODEL 2u      /* "model" */

extern const char *const gb_scene_signal_names[];     /* {"apparent_temperature", "measured_radiance", NULL} */
extern const char *const gb_scene_reflected_names[];  /* {"reflected_temperature", "reflected_radiance", NULL} */
extern const char *const gb_scene_atmosphere_names[]; /* {"atmosphere_temperature", "path_radiance", NULL} */
extern const char *const gb_scene_model_names[];      /* {"band", "total", NULL} */

/* The scene as the request gives it. */
typedef struct gb_scene_request {
    gb_temperature_unit unit;
    size_t signal_form, reflected_form, atmosphere_form; /* gb_term_form */
    gb_num signal, emissivity, reflected, transmittance, atmosphere;
    gb_band band;
    gb_band total;
    size_t model; /* gb_scene_model */
} gb_scene_request;

/* Element inputs, in this order, for gb_scene_build() and elementwise batches. */
enum { GB_SCENE_IN_SIGNAL = 0, GB_SCENE_IN_EMISSIVITY, GB_SCENE_IN_REFLECTED,
       GB_SCENE_IN_TRANSMITTANCE, GB_SCENE_IN_ATMOSPHERE, GB_SCENE_IN_COUNT };

/* `array`: GB_ARRAY_OK or 0; `parts`: GB_SCENE_* bits.  Without GB_SCENE_EMISSIVITY it is 1. */
bool gb_scene_read(gb_params *p, unsigned array, unsigned parts, gb_scene_request *s);

/* The gb_num inputs in GB_SCENE_IN_* order (for gb_params_broadcast and batches). */
void gb_scene_inputs(const gb_scene_request *s, const gb_num *inputs[GB_SCENE_IN_COUNT]);

/* One element's scene in core units (`in` in GB_SCENE_IN_* order); on failure *field names the input. */
gb_status gb_scene_build(const gb_scene_request *s, const double *in, gb_scene *scene,
                         const char **field);

/* The field a status of the solver itself points at (a gb_field_fn; context: the request). */
const char *gb_scene_field_for(const void *context, gb_status status);

const char *gb_scene_signal_field(const gb_scene_request *s);
const gb_band *gb_scene_model_band(const gb_scene_request *s);
/* Every term given as a temperature (the sigma T^4 comparison is meaningful). */
bool gb_scene_temperature_inputs(const gb_scene_request *s);

/* The standard uncertainties of the scene's inputs, indexed by gb_input. */
typedef struct gb_scene_uncertainty {
    double given[GB_INPUT_COUNT];          /* as given, in the request's units */
    double kelvin[GB_INPUT_COUNT];         /* temperature-form ones as kelvin-sized differences */
    bool is_temperature[GB_INPUT_COUNT];   /* the input is a temperature */
    const char *names[GB_INPUT_COUNT];     /* the input's field name, e.g. "reflected_temperature" */
} gb_scene_uncertainty;

/*
 * Reads u_<input> for the signal, reflected, transmittance and atmosphere
 * inputs, and u_emissivity when the scene has an emissivity (parts as for
 * gb_scene_read); scalars only, default 0.  A u_ of the other form than the
 * input given -> conflicting_fields; < 0 -> 422 naming it; u_transmittance
 * > 0 with no atmosphere -> missing_field "atmosphere_temperature".
 */
bool gb_scene_read_uncertainty(gb_params *p, const gb_scene_request *s, unsigned parts,
                               gb_scene_uncertainty *u);

#endif
