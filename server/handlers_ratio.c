/*
 * /v1/ratio-temperature: two-colour (ratio) temperature (core/ratio.h) from
 * the ratio of the signals in two channels -- two wavelengths or two bands --
 * for a grey body, or for a known emissivity ratio eps1/eps2.  Exact Planck;
 * the Wien approximation beside it for single wavelengths.
 *
 * Channels: `wavelengths` [l1, l2] (in `wavelength_unit`, um by default;
 * l1 < l2) or `bands` [band, band] (band objects as everywhere, presets
 * included).  GET: wavelengths=0.9,1.05 or bands=0.8,0.9;1.0,1.1 (';'
 * between the two bands, each written as the `band` parameter is).
 */
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "elementwise.h"
#include "handlers.h"
#include "ratio.h"
#include "units.h"

static const char *const channel_names[] = {"wavelengths", "bands", NULL};
enum { BY_WAVELENGTHS = 0, BY_BANDS = 1 };

typedef struct ratio_request {
    gb_temperature_unit unit;
    size_t kind;
    gb_channel first, second;
    gb_num signal_ratio, emissivity_ratio;
} ratio_request;

static const char *ratio_field(const void *context, gb_status status)
{
    const ratio_request *r = context;
    if (gb_params_is_band_status(status) || status == GB_ERR_SPECTRAL_DOMAIN) {
        return channel_names[r->kind];
    }
    return status == GB_ERR_EMISSIVITY_DOMAIN ? "emissivity_ratio" : "signal_ratio";
}

/* in: signal ratio, emissivity ratio; out: T, [T (Wien) for wavelengths,] dT/d r_eps */
static gb_status ratio_element(const void *context, const double *in, double *out,
                               const char **field)
{
    const ratio_request *r = context;
    gb_ratio_result result;
    double per_kelvin = 1.0;
    if (!(in[0] > 0.0)) {
        *field = "signal_ratio"; /* a ratio of two signals is positive: no temperature gives it */
        return GB_ERR_RATIO_UNREACHABLE;
    }
    gb_status status = gb_ratio_temperature(&r->first, &r->second, in[0], in[1], &result);
    if (status == GB_OK) {
        status = gb_temperature_from_kelvin(result.temperature_k, r->unit, &out[0]);
    }
    if (status != GB_OK) {
        return status;
    }
    size_t sensitivity_at = 1;
    if (r->kind == BY_WAVELENGTHS) {
        sensitivity_at = 2;
        if (result.has_wien_temperature) {
            gb_temperature_from_kelvin(result.wien_temperature_k, r->unit, &out[1]);
        }
    }
    gb_temperature_difference_from_kelvin(1.0, r->unit, &per_kelvin);
    out[sensitivity_at] = result.emissivity_ratio_sensitivity * per_kelvin;
    return GB_OK;
}

static bool read_wavelengths(gb_params *p, ratio_request *r)
{
    gb_wavelength_unit unit;
    bool unit_given = false;
    const double *values = NULL;
    size_t count = 0;
    if (!gb_params_wavelength_unit(p, &unit, &unit_given) ||
        !gb_params_number_list(p, "wavelengths", NULL, 0, &values, &count)) {
        return false;
    }
    if (count != 2) {
        return gb_params_fail(p, GB_PROBLEM_WRONG_TYPE, "wavelengths",
                              "\"wavelengths\" must be two wavelengths [l1, l2], the shorter "
                              "first.");
    }
    double um[2];
    for (size_t i = 0; i < 2; i++) {
        if (gb_wavelength_to_micrometres(values[i], unit, &um[i]) != GB_OK) {
            return gb_params_fail_status(p, GB_ERR_SPECTRAL_DOMAIN, "wavelengths");
        }
    }
    if (!(um[0] < um[1])) {
        gb_problem_from_status(p->problem, GB_ERR_BAND_REVERSED, "wavelengths",
                               "The first wavelength must be the shorter one, so that the ratio "
                               "rises with temperature.");
        return false;
    }
    r->first = (gb_channel){0, um[0], {0}};
    r->second = (gb_channel){0, um[1], {0}};
    return true;
}

/* GET: "A;B", each as the band query parameter ("lo,hi", "preset:name"). */
static bool band_pair_from_text(gb_params *p, const char *text, gb_band bands[2])
{
    const char *split = strchr(text, ';');
    if (split == NULL || strchr(split + 1, ';') != NULL) {
        return gb_params_fail(p, GB_PROBLEM_INVALID_BAND, "bands",
                              "\"bands\" must be two bands separated by ';', such as "
                              "0.8,0.9;1.0,1.1.");
    }
    json_t *parts[2] = {json_stringn(text, (size_t)(split - text)), json_string(split + 1)};
    bool ok = parts[0] != NULL && parts[1] != NULL &&
              gb_params_band_value(p, "bands", parts[0], &bands[0]) &&
              gb_params_band_value(p, "bands", parts[1], &bands[1]);
    json_decref(parts[0]);
    json_decref(parts[1]);
    return ok;
}

static bool read_bands(gb_params *p, ratio_request *r)
{
    json_t *value = json_object_get(p->root, "bands");
    gb_band bands[2];
    bool ok;
    if (p->from_query) {
        ok = json_is_string(value) && band_pair_from_text(p, json_string_value(value), bands);
    } else if (!json_is_array(value) || json_array_size(value) != 2) {
        return gb_params_fail(p, GB_PROBLEM_INVALID_BAND, "bands",
                              "\"bands\" must be an array of two bands, the shorter-wave first.");
    } else {
        ok = gb_params_band_value(p, "bands", json_array_get(value, 0), &bands[0]) &&
             gb_params_band_value(p, "bands", json_array_get(value, 1), &bands[1]);
    }
    if (!ok) {
        return false;
    }
    r->first = (gb_channel){1, 0.0, bands[0]};
    r->second = (gb_channel){1, 0.0, bands[1]};
    return true;
}

/* A scalar ratio that cannot be right gets a sentence about ratios, not radiances. */
static bool check_scalar_ratios(gb_params *p, const ratio_request *r)
{
    if (!r->signal_ratio.is_array && !(r->signal_ratio.scalar > 0.0)) {
        gb_problem_from_status(p->problem, GB_ERR_RATIO_UNREACHABLE, "signal_ratio",
                               "\"signal_ratio\" is the first channel's signal over the second's "
                               "and must be above 0.");
        return false;
    }
    if (!r->emissivity_ratio.is_array && !(r->emissivity_ratio.scalar > 0.0)) {
        gb_problem_from_status(p->problem, GB_ERR_EMISSIVITY_DOMAIN, "emissivity_ratio",
                               "\"emissivity_ratio\" is eps1/eps2 and must be above 0 (1 for a "
                               "grey body).");
        return false;
    }
    return true;
}

void gb_handle_ratio_temperature(const gb_call *call, gb_reply *reply)
{
    static const char *const fields[] = {"wavelengths", "wavelength_unit", "bands",
                                         "signal_ratio", "emissivity_ratio", "temperature_unit",
                                         NULL};
    gb_problem problem;
    gb_problem_clear(&problem);
    gb_params p;
    ratio_request r;
    gb_elementwise batch = {0};
    memset(&r, 0, sizeof r);
    bool ok = gb_params_begin(&p, call->input, call->from_query, call->config->max_array,
                              fields, &problem) &&
              gb_params_temperature_unit(&p, &r.unit) &&
              gb_params_one_of(&p, channel_names, true, &r.kind) &&
              (r.kind == BY_WAVELENGTHS ? read_wavelengths(&p, &r) : read_bands(&p, &r));
    if (ok && r.kind == BY_BANDS && gb_params_has(&p, "wavelength_unit")) {
        ok = gb_params_fail(&p, GB_PROBLEM_CONFLICTING_FIELDS, "wavelength_unit",
                            "\"wavelength_unit\" applies to \"wavelengths\"; band limits are in "
                            "um (or cm-1 for a wavenumber band).");
    }
    ok = ok && gb_params_number(&p, "signal_ratio", GB_REQUIRED | GB_ARRAY_OK, 0.0,
                                &r.signal_ratio) &&
         gb_params_number(&p, "emissivity_ratio", GB_ARRAY_OK, 1.0, &r.emissivity_ratio) &&
         check_scalar_ratios(&p, &r);
    batch.inputs[0] = &r.signal_ratio;
    batch.inputs[1] = &r.emissivity_ratio;
    batch.input_count = 2;
    ok = ok && gb_params_broadcast(&p, batch.inputs, 2, &batch.count, &batch.is_array);
    if (!ok) {
        gb_reply_problem(reply, &problem);
        gb_params_end(&p);
        return;
    }
    const char *unit = gb_temperature_unit_symbol(r.unit);
    batch.outputs[0] = (gb_output){"temperature", "temperature_unit", unit, false};
    batch.output_count = 1;
    if (r.kind == BY_WAVELENGTHS) {
        /* The Wien formula has no answer where its denominator is not positive: null. */
        batch.outputs[batch.output_count++] = (gb_output){"wien_temperature", NULL, NULL, true};
    }
    batch.outputs[batch.output_count++] =
        (gb_output){"emissivity_ratio_sensitivity", NULL, NULL, false};
    batch.element = ratio_element;
    batch.field_for = ratio_field;
    batch.context = &r;
    gb_elementwise_reply(&batch, reply);
    gb_params_end(&p);
}
