/*
 * /v1/radiance, /v1/brightness-temperature, /v1/peak: Planck's law at one
 * spectral position, its inverse, and Wien's displacement law.
 */
#include <stdio.h>

#include "elementwise.h"
#include "constants.h"
#include "handlers.h"
#include "planck.h"
#include "spectral.h"
#include "units.h"

/* ------------------------------------------------------------ radiance ---- */

typedef struct radiance_context {
    gb_spectral spectral;
    gb_temperature_unit unit;
    const char *value_field; /* the input every other status is about */
} radiance_context;

/* Shared by radiance and brightness temperature: position, emissivity, else the value. */
static const char *spectral_field(const void *context, gb_status status)
{
    const radiance_context *c = context;
    switch (status) {
    case GB_ERR_SPECTRAL_DOMAIN: return c->spectral.field;
    case GB_ERR_EMISSIVITY_DOMAIN: return "emissivity";
    default: return c->value_field;
    }
}

/* in: temperature, position, emissivity; out: radiance, exitance, photon radiance */
static gb_status radiance_element(const void *context, const double *in, double *out,
                                  const char **field)
{
    const radiance_context *c = context;
    double kelvin, position, radiance, photons;
    gb_status status = gb_temperature_to_kelvin(in[0], c->unit, &kelvin);
    if (status != GB_OK) {
        *field = "temperature";
        return status;
    }
    status = gb_spectral_to_core(&c->spectral, in[1], &position);
    if (status != GB_OK) {
        *field = c->spectral.field;
        return status;
    }
    status = gb_planck_radiance(c->spectral.coordinate, position, kelvin, in[2], &radiance);
    if (status == GB_OK) {
        status = gb_planck_photon_radiance(c->spectral.coordinate, position, kelvin, in[2],
                                           &photons);
    }
    if (status != GB_OK) {
        return status;
    }
    out[0] = gb_spectral_density_out(&c->spectral, radiance);
    out[1] = GB_PI * out[0];
    out[2] = gb_spectral_density_out(&c->spectral, photons);
    return GB_OK;
}

/*
 * The inputs radiance and brightness temperature share: a value named `c->value_field`, a
 * spectral position and an emissivity, broadcast together.  On failure `problem` is set.
 */
static bool read_spectral_inputs(const gb_call *call, const char *const *fields, gb_params *p,
                                 radiance_context *c, gb_num nums[3], gb_elementwise *batch,
                                 gb_problem *problem)
{
    bool ok = gb_params_begin(p, call->input, call->from_query, call->config->max_array, fields,
                              problem) &&
              gb_params_temperature_unit(p, &c->unit) &&
              gb_params_number(p, c->value_field, GB_REQUIRED | GB_ARRAY_OK, 0.0, &nums[0]) &&
              gb_spectral_read(p, &c->spectral, &nums[1]) &&
              gb_params_number(p, "emissivity", GB_ARRAY_OK, 1.0, &nums[2]);
    for (size_t i = 0; i < 3; i++) {
        batch->inputs[i] = &nums[i];
    }
    batch->input_count = 3;
    return ok && gb_params_broadcast(p, batch->inputs, batch->input_count, &batch->count,
                                     &batch->is_array);
}

void gb_handle_radiance(const gb_call *call, gb_reply *reply)
{
    static const char *const fields[] = {"temperature", "wavelength", "wavenumber",
                                         "frequency", "wavelength_unit", "emissivity",
                                         "temperature_unit", NULL};
    gb_problem problem;
    gb_problem_clear(&problem);
    gb_params p;
    radiance_context c = {.value_field = "temperature"};
    gb_num nums[3];
    gb_elementwise batch = {0};
    bool ok = read_spectral_inputs(call, fields, &p, &c, nums, &batch, &problem);
    if (!ok) {
        gb_reply_problem(reply, &problem);
        gb_params_end(&p);
        return;
    }
    char radiance_unit[48], exitance_unit[48], photon_unit[64];
    snprintf(radiance_unit, sizeof radiance_unit, "W m-2 sr-1 %s", c.spectral.per);
    snprintf(exitance_unit, sizeof exitance_unit, "W m-2 %s", c.spectral.per);
    snprintf(photon_unit, sizeof photon_unit, "photons s-1 m-2 sr-1 %s", c.spectral.per);
    batch.outputs[0] = (gb_output){"radiance", "radiance_unit", radiance_unit, false};
    batch.outputs[1] = (gb_output){"exitance", "exitance_unit", exitance_unit, false};
    batch.outputs[2] = (gb_output){"photon_radiance", "photon_radiance_unit", photon_unit, false};
    batch.output_count = 3;
    batch.extras[0][0] = "temperature_unit";
    batch.extras[0][1] = gb_temperature_unit_symbol(c.unit);
    batch.extra_count = 1;
    batch.element = radiance_element;
    batch.field_for = spectral_field;
    batch.context = &c;
    gb_elementwise_reply(&batch, reply);
    gb_params_end(&p);
}

/* ------------------------------------------------- brightness temperature ---- */

/* in: radiance, position, emissivity; out: temperature */
static gb_status brightness_element(const void *context, const double *in, double *out,
                                    const char **field)
{
    const radiance_context *c = context;
    double position, kelvin;
    gb_status status = gb_spectral_to_core(&c->spectral, in[1], &position);
    if (status != GB_OK) {
        *field = c->spectral.field;
        return status;
    }
    status = gb_brightness_temperature(c->spectral.coordinate, position,
                                       gb_spectral_density_in(&c->spectral, in[0]), in[2],
                                       &kelvin);
    if (status != GB_OK) {
        return status;
    }
    return gb_temperature_from_kelvin(kelvin, c->unit, &out[0]);
}

void gb_handle_brightness_temperature(const gb_call *call, gb_reply *reply)
{
    static const char *const fields[] = {"radiance", "wavelength", "wavenumber",
                                         "frequency", "wavelength_unit", "emissivity",
                                         "temperature_unit", NULL};
    gb_problem problem;
    gb_problem_clear(&problem);
    gb_params p;
    radiance_context c = {.value_field = "radiance"};
    gb_num nums[3];
    gb_elementwise batch = {0};
    bool ok = read_spectral_inputs(call, fields, &p, &c, nums, &batch, &problem);
    if (!ok) {
        gb_reply_problem(reply, &problem);
        gb_params_end(&p);
        return;
    }
    batch.outputs[0] = (gb_output){"temperature", "temperature_unit",
                                   gb_temperature_unit_symbol(c.unit), false};
    batch.output_count = 1;
    batch.element = brightness_element;
    batch.field_for = spectral_field;
    batch.context = &c;
    gb_elementwise_reply(&batch, reply);
    gb_params_end(&p);
}

/* ---------------------------------------------------------------- peak ---- */

#define HZ_PER_THZ 1e12

typedef struct peak_context {
    gb_temperature_unit unit;
} peak_context;

static const char *peak_temperature_field(const void *context, gb_status status)
{
    (void)context;
    (void)status;
    return "temperature";
}

static const char *peak_wavelength_field(const void *context, gb_status status)
{
    (void)context;
    (void)status;
    return "peak_wavelength";
}

/* in: temperature; out: the peaks */
static gb_status peaks_element(const void *context, const double *in, double *out,
                               const char **field)
{
    const peak_context *c = context;
    double kelvin;
    gb_wien_peaks peaks;
    (void)field;
    gb_status status = gb_temperature_to_kelvin(in[0], c->unit, &kelvin);
    if (status == GB_OK) {
        status = gb_wien_peaks_at(kelvin, &peaks);
    }
    if (status != GB_OK) {
        return status;
    }
    out[0] = peaks.wavelength_um;
    out[1] = peaks.wavenumber_cm;
    out[2] = peaks.frequency_hz / HZ_PER_THZ;
    out[3] = peaks.photon_wavelength_um;
    out[4] = peaks.radiance_at_peak;
    return GB_OK;
}

/* in: peak wavelength (um); out: temperature */
static gb_status wien_temperature_element(const void *context, const double *in, double *out,
                                          const char **field)
{
    const peak_context *c = context;
    double kelvin;
    (void)field;
    gb_status status = gb_wien_temperature(in[0], &kelvin);
    if (status != GB_OK) {
        return status;
    }
    return gb_temperature_from_kelvin(kelvin, c->unit, &out[0]);
}

void gb_handle_peak(const gb_call *call, gb_reply *reply)
{
    static const char *const fields[] = {"temperature", "peak_wavelength", "temperature_unit",
                                         NULL};
    static const char *const inputs[] = {"temperature", "peak_wavelength", NULL};
    gb_problem problem;
    gb_problem_clear(&problem);
    gb_params p;
    peak_context c;
    size_t which = 0;
    gb_num input;
    gb_elementwise batch = {0};
    bool ok = gb_params_begin(&p, call->input, call->from_query, call->config->max_array, fields,
                              &problem) &&
              gb_params_temperature_unit(&p, &c.unit) &&
              gb_params_one_of(&p, inputs, true, &which) &&
              gb_params_number(&p, inputs[which], GB_REQUIRED | GB_ARRAY_OK, 0.0, &input);
    batch.inputs[0] = &input;
    batch.input_count = 1;
    ok = ok && gb_params_broadcast(&p, batch.inputs, 1, &batch.count, &batch.is_array);
    if (!ok) {
        gb_reply_problem(reply, &problem);
        gb_params_end(&p);
        return;
    }
    const char *unit = gb_temperature_unit_symbol(c.unit);
    if (which == 0) {
        batch.outputs[0] = (gb_output){"peak_wavelength", NULL, NULL, false};
        batch.outputs[1] = (gb_output){"peak_wavenumber", NULL, NULL, false};
        batch.outputs[2] = (gb_output){"peak_frequency", NULL, NULL, false};
        batch.outputs[3] = (gb_output){"peak_photon_wavelength", NULL, NULL, false};
        batch.outputs[4] =
            (gb_output){"peak_radiance", "peak_radiance_unit", "W m-2 sr-1 um-1", false};
        batch.output_count = 5;
        batch.extras[0][0] = "temperature_unit";
        batch.extras[0][1] = unit;
        batch.extra_count = 1;
        batch.element = peaks_element;
        batch.field_for = peak_temperature_field;
    } else {
        batch.outputs[0] = (gb_output){"temperature", "temperature_unit", unit, false};
        batch.output_count = 1;
        batch.element = wien_temperature_element;
        batch.field_for = peak_wavelength_field;
    }
    batch.context = &c;
    gb_elementwise_reply(&batch, reply);
    gb_params_end(&p);
}
