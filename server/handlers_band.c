/*
 * /v1/band and /v1/band-temperature: radiometric quantities integrated over a
 * sensor band, and the inverse (the temperature giving a band radiance).
 */
#include "band.h"
#include "elementwise.h"
#include "constants.h"
#include "handlers.h"
#include "units.h"

typedef struct band_context {
    gb_band band;
    gb_temperature_unit unit;
    const char *signal_field; /* band-temperature: "radiance" or "exitance" */
    bool exitance;
} band_context;

static const char *band_field(const void *context, gb_status status)
{
    const band_context *c = context;
    switch (status) {
    case GB_ERR_EMISSIVITY_DOMAIN: return "emissivity";
    case GB_ERR_BAND_LIMITS:
    case GB_ERR_BAND_REVERSED:
    case GB_ERR_RESPONSE_TOO_SHORT:
    case GB_ERR_RESPONSE_UNSORTED:
    case GB_ERR_RESPONSE_NEGATIVE:
    case GB_ERR_RESPONSE_ALL_ZERO: return "band";
    default: return c->signal_field != NULL ? c->signal_field : "temperature";
    }
}

/* in: temperature, emissivity; out: the band quantities */
static gb_status band_element(const void *context, const double *in, double *out,
                              const char **field)
{
    const band_context *c = context;
    double kelvin;
    gb_band_quantities q;
    gb_status status = gb_temperature_to_kelvin(in[0], c->unit, &kelvin);
    if (status != GB_OK) {
        *field = "temperature";
        return status;
    }
    status = gb_band_evaluate(&c->band, kelvin, in[1], &q);
    if (status != GB_OK) {
        return status;
    }
    out[0] = q.radiance;
    out[1] = q.exitance;
    out[2] = q.photon_exitance;
    out[3] = q.fraction;
    out[4] = q.total_exitance;
    out[5] = q.radiance_derivative;
    return GB_OK;
}

static void reply_or_fail(gb_reply *reply, const gb_problem *problem, gb_params *p, bool ok,
                          const gb_elementwise *batch)
{
    if (ok) {
        gb_elementwise_reply(batch, reply);
    } else {
        gb_reply_problem(reply, problem);
    }
    gb_params_end(p);
}

void gb_handle_band(const gb_call *call, gb_reply *reply)
{
    static const char *const fields[] = {"temperature", "band", "emissivity", "temperature_unit",
                                         NULL};
    gb_problem problem;
    gb_problem_clear(&problem);
    gb_params p;
    band_context c = {.signal_field = NULL};
    bool band_given = false;
    gb_num temperature, emissivity;
    gb_elementwise batch = {0};
    bool ok = gb_params_begin(&p, call->input, call->from_query, call->config->max_array, fields,
                              &problem) &&
              gb_params_temperature_unit(&p, &c.unit) &&
              gb_params_number(&p, "temperature", GB_REQUIRED | GB_ARRAY_OK, 0.0,
                               &temperature) &&
              gb_params_band(&p, false, &c.band, &band_given) &&
              gb_params_number(&p, "emissivity", GB_ARRAY_OK, 1.0, &emissivity);
    batch.inputs[0] = &temperature;
    batch.inputs[1] = &emissivity;
    batch.input_count = 2;
    ok = ok && gb_params_broadcast(&p, batch.inputs, 2, &batch.count, &batch.is_array);
    batch.outputs[0] = (gb_output){"radiance", "radiance_unit", "W m-2 sr-1", false};
    batch.outputs[1] = (gb_output){"exitance", "exitance_unit", "W m-2", false};
    batch.outputs[2] =
        (gb_output){"photon_exitance", "photon_exitance_unit", "photons s-1 m-2", false};
    batch.outputs[3] = (gb_output){"fraction", NULL, NULL, false};
    batch.outputs[4] = (gb_output){"total_exitance", "total_exitance_unit", "W m-2", false};
    batch.outputs[5] = (gb_output){"radiance_derivative", "radiance_derivative_unit",
                                   "W m-2 sr-1 K-1", false};
    batch.output_count = 6;
    batch.extras[0][0] = "temperature_unit";
    batch.extras[0][1] = gb_temperature_unit_symbol(c.unit);
    batch.extra_count = 1;
    batch.element = band_element;
    batch.field_for = band_field;
    batch.context = &c;
    reply_or_fail(reply, &problem, &p, ok, &batch);
}

/* in: radiance or exitance, emissivity; out: temperature */
static gb_status band_temperature_element(const void *context, const double *in, double *out,
                                          const char **field)
{
    const band_context *c = context;
    double kelvin;
    double radiance = c->exitance ? in[0] / GB_PI : in[0];
    (void)field;
    gb_status status = gb_band_temperature(&c->band, radiance, in[1], &kelvin);
    if (status != GB_OK) {
        return status;
    }
    return gb_temperature_from_kelvin(kelvin, c->unit, &out[0]);
}

void gb_handle_band_temperature(const gb_call *call, gb_reply *reply)
{
    static const char *const fields[] = {"radiance", "exitance", "band", "emissivity",
                                         "temperature_unit", NULL};
    static const char *const signals[] = {"radiance", "exitance", NULL};
    gb_problem problem;
    gb_problem_clear(&problem);
    gb_params p;
    band_context c = {.signal_field = "radiance"};
    bool band_given = false;
    size_t which = 0;
    gb_num signal, emissivity;
    gb_elementwise batch = {0};
    bool ok = gb_params_begin(&p, call->input, call->from_query, call->config->max_array, fields,
                              &problem) &&
              gb_params_temperature_unit(&p, &c.unit) &&
              gb_params_one_of(&p, signals, true, &which) &&
              gb_params_number(&p, signals[which], GB_REQUIRED | GB_ARRAY_OK, 0.0, &signal) &&
              gb_params_band(&p, false, &c.band, &band_given) &&
              gb_params_number(&p, "emissivity", GB_ARRAY_OK, 1.0, &emissivity);
    c.signal_field = signals[ok ? which : 0];
    c.exitance = ok && which == 1;
    batch.inputs[0] = &signal;
    batch.inputs[1] = &emissivity;
    batch.input_count = 2;
    ok = ok && gb_params_broadcast(&p, batch.inputs, 2, &batch.count, &batch.is_array);
    batch.outputs[0] = (gb_output){"temperature", "temperature_unit",
                                   gb_temperature_unit_symbol(c.unit), false};
    batch.output_count = 1;
    batch.element = band_temperature_element;
    batch.field_for = band_field;
    batch.context = &c;
    reply_or_fail(reply, &problem, &p, ok, &batch);
}
