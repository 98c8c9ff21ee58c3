/*
 * /v1/spectrum: Planck curves of several temperatures over a wavelength or
 * wavenumber range, shaped for plotting: one shared grid (core/spectrum.h,
 * linear or logarithmic) and per temperature the spectral radiance on it
 * (core/batch.h), the curve's peak (Wien's displacement law, planck.h) and,
 * when a band is given, the blackbody fraction in that band (band.h).
 *
 * Limits: the grid has 2 to --max-spectrum-points points, at most
 * --max-spectrum-curves temperatures; spectra of more than
 * LIGHT_SPECTRUM_VALUES values take a heavy-work slot (heavywork.h).
 */
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "band.h"
#include "batch.h"
#include "handlers.h"
#include "params.h"
#include "planck.h"
#include "spectrum.h"
#include "units.h"

#define DEFAULT_POINTS 200
/* Radiance values a spectrum may hold and still count as light work. */
#define LIGHT_SPECTRUM_VALUES 65536

static const char *const range_names[] = {"wavelength_range", "wavenumber_range", NULL};
static const char *const spacing_names[] = {"linear", "logarithmic", NULL};

typedef struct spectrum_request {
    gb_temperature_unit unit;
    size_t range_kind; /* 0: wavelength (um), 1: wavenumber (cm-1) */
    double lower, upper;
    size_t points;
    size_t spacing;
    double emissivity;
    const double *temperatures;
    size_t curve_count;
    double kelvin[GB_CONFIG_MAX_SPECTRUM_CURVES];
    gb_band band;
    bool band_given;
} spectrum_request;

static bool read_range(gb_params *p, spectrum_request *r)
{
    const double *limits = NULL;
    size_t count = 0;
    if (!gb_params_one_of(p, range_names, true, &r->range_kind) ||
        !gb_params_number_list(p, range_names[r->range_kind], NULL, 0, &limits, &count)) {
        return false;
    }
    if (count != 2) {
        return gb_params_fail(p, GB_PROBLEM_WRONG_TYPE, range_names[r->range_kind],
                              "\"%s\" must be two limits [lo, hi].", range_names[r->range_kind]);
    }
    r->lower = limits[0];
    r->upper = limits[1];
    gb_status status = !(r->lower > 0.0)       ? GB_ERR_BAND_LIMITS
                       : !(r->lower < r->upper) ? GB_ERR_BAND_REVERSED
                                                : GB_OK;
    return status == GB_OK || gb_params_fail_status(p, status, range_names[r->range_kind]);
}

static bool read_counts(gb_params *p, const gb_config *config, spectrum_request *r)
{
    gb_num points;
    double fallback = DEFAULT_POINTS < config->max_spectrum_points
                          ? (double)DEFAULT_POINTS
                          : (double)config->max_spectrum_points;
    if (!gb_params_number(p, "points", 0, fallback, &points)) {
        return false;
    }
    if (!(points.scalar >= 2.0 && points.scalar <= (double)config->max_spectrum_points &&
          floor(points.scalar) == points.scalar)) {
        return gb_params_fail(p, GB_PROBLEM_WRONG_TYPE, "points",
                              "\"points\" must be a whole number from 2 to %zu (this server's "
                              "--max-spectrum-points).",
                              config->max_spectrum_points);
    }
    r->points = (size_t)points.scalar;
    if (!gb_params_has(p, "temperatures")) {
        return gb_params_fail(p, GB_PROBLEM_MISSING_FIELD, "temperatures",
                              "The field \"temperatures\" is required.");
    }
    if (!gb_params_number_list(p, "temperatures", NULL, 0, &r->temperatures, &r->curve_count)) {
        return false;
    }
    if (r->curve_count > config->max_spectrum_curves) {
        return gb_params_fail(p, GB_PROBLEM_ARRAY_TOO_LONG, "temperatures",
                              "\"temperatures\" has %zu values; at most %zu curves are drawn "
                              "at once (this server's --max-spectrum-curves).",
                              r->curve_count, config->max_spectrum_curves);
    }
    for (size_t i = 0; i < r->curve_count; i++) {
        gb_status status = gb_temperature_to_kelvin(r->temperatures[i], r->unit, &r->kelvin[i]);
        if (status != GB_OK) {
            gb_problem_from_status(p->problem, status, "temperatures", NULL);
            snprintf(p->problem->detail, sizeof p->problem->detail,
                     "temperatures[%zu] is out of range: temperatures must be above 0 K and "
                     "at most 1e9 K.",
                     i);
            return false;
        }
    }
    return true;
}

static bool read_request(gb_params *p, const gb_config *config, spectrum_request *r)
{
    gb_num emissivity;
    if (!gb_params_temperature_unit(p, &r->unit) || !read_range(p, r) ||
        !read_counts(p, config, r) ||
        !gb_params_choice(p, "spacing", spacing_names, GB_GRID_LINEAR, &r->spacing) ||
        !gb_params_number(p, "emissivity", 0, 1.0, &emissivity) ||
        !gb_params_band(p, false, &r->band, &r->band_given)) {
        return false;
    }
    r->emissivity = emissivity.scalar;
    if (gb_check_emissivity(r->emissivity) != GB_OK) {
        return gb_params_fail_status(p, GB_ERR_EMISSIVITY_DOMAIN, "emissivity");
    }
    return true;
}

/* One curve: radiance on the grid, the peak, the band fraction. */
static gb_status write_curve(const spectrum_request *r, gb_spectral_coordinate coordinate,
                             const double *grid, size_t i, double *radiance,
                             gb_status *statuses, gb_jw *w)
{
    double kelvin = r->kelvin[i];
    double peak_radiance = 0.0;
    gb_wien_peaks peaks;
    gb_status status = gb_batch_planck_radiance(coordinate, r->points, GB_ARRAY(grid),
                                                GB_BROADCAST(&kelvin),
                                                GB_BROADCAST(&r->emissivity), radiance, statuses);
    for (size_t k = 0; status == GB_OK && k < r->points; k++) {
        status = statuses[k];
    }
    if (status == GB_OK) {
        status = gb_wien_peaks_at(kelvin, &peaks);
    }
    double peak_position = coordinate == GB_WAVELENGTH ? peaks.wavelength_um : peaks.wavenumber_cm;
    if (status == GB_OK) {
        status = gb_planck_radiance(coordinate, peak_position, kelvin, r->emissivity,
                                    &peak_radiance);
    }
    gb_band_quantities band;
    if (status == GB_OK && r->band_given) {
        status = gb_band_evaluate(&r->band, kelvin, 1.0, &band);
    }
    if (status != GB_OK) {
        return status;
    }
    gb_jw_object_begin(w);
    gb_jw_knumber(w, "temperature", r->temperatures[i]);
    gb_jw_key(w, "radiance");
    gb_jw_array_begin(w);
    for (size_t k = 0; k < r->points && !w->failed; k++) {
        gb_jw_number(w, radiance[k]);
    }
    gb_jw_array_end(w);
    gb_jw_knumber(w, coordinate == GB_WAVELENGTH ? "peak_wavelength" : "peak_wavenumber",
                  peak_position);
    gb_jw_knumber(w, "peak_radiance", peak_radiance);
    if (r->band_given) {
        gb_jw_knumber(w, "band_fraction", band.fraction);
    }
    gb_jw_object_end(w);
    return GB_OK;
}

static void reply_spectrum(const spectrum_request *r, gb_reply *reply)
{
    gb_spectral_coordinate coordinate = r->range_kind == 0 ? GB_WAVELENGTH : GB_WAVENUMBER;
    double *grid = malloc(r->points * sizeof *grid);
    double *radiance = malloc(r->points * sizeof *radiance);
    gb_status *statuses = malloc(r->points * sizeof *statuses);
    if (grid == NULL || radiance == NULL || statuses == NULL) {
        free(grid);
        free(radiance);
        free(statuses);
        gb_reply_fail(reply, GB_PROBLEM_INTERNAL, NULL, "Out of memory.");
        return;
    }
    gb_status status = gb_spectral_grid(r->lower, r->upper, r->points,
                                        (gb_grid_spacing)r->spacing, grid);
    gb_jw w;
    gb_jw_init(&w, 256 + 24 * r->points * (r->curve_count + 1));
    gb_jw_object_begin(&w);
    gb_jw_key(&w, coordinate == GB_WAVELENGTH ? "wavelength" : "wavenumber");
    gb_jw_array_begin(&w);
    for (size_t k = 0; status == GB_OK && k < r->points && !w.failed; k++) {
        gb_jw_number(&w, grid[k]);
    }
    gb_jw_array_end(&w);
    gb_jw_kstring(&w, coordinate == GB_WAVELENGTH ? "wavelength_unit" : "wavenumber_unit",
                  coordinate == GB_WAVELENGTH ? "um" : "cm-1");
    gb_jw_kstring(&w, "spacing", spacing_names[r->spacing]);
    gb_jw_kstring(&w, "radiance_unit",
                  coordinate == GB_WAVELENGTH ? "W m-2 sr-1 um-1" : "W m-2 sr-1 (cm-1)-1");
    gb_jw_kstring(&w, "temperature_unit", gb_temperature_unit_symbol(r->unit));
    gb_jw_knumber(&w, "emissivity", r->emissivity);
    gb_jw_key(&w, "curves");
    gb_jw_array_begin(&w);
    for (size_t i = 0; status == GB_OK && i < r->curve_count; i++) {
        status = write_curve(r, coordinate, grid, i, radiance, statuses, &w);
    }
    gb_jw_array_end(&w);
    gb_jw_object_end(&w);
    free(grid);
    free(radiance);
    free(statuses);
    if (status != GB_OK) {
        gb_jw_free(&w);
        gb_problem problem;
        gb_problem_clear(&problem);
        gb_problem_from_status(&problem, status == GB_ERR_NOT_FINITE ? GB_ERR_RESULT_OVERFLOW
                                                                     : status,
                               range_names[r->range_kind], NULL);
        gb_reply_problem(reply, &problem);
        return;
    }
    gb_reply_json(reply, 200, &w);
}

void gb_handle_spectrum(const gb_call *call, gb_reply *reply)
{
    static const char *const fields[] = {"temperatures", "wavelength_range", "wavenumber_range",
                                         "points", "spacing", "emissivity", "band",
                                         "temperature_unit", NULL};
    gb_problem problem;
    gb_problem_clear(&problem);
    gb_params p;
    spectrum_request r;
    memset(&r, 0, sizeof r);
    bool ok = gb_params_begin(&p, call->input, call->from_query, call->config->max_array,
                              fields, &problem) &&
              read_request(&p, call->config, &r);
    if (ok && r.points * r.curve_count > LIGHT_SPECTRUM_VALUES &&
        !gb_heavy_work_enter(call->heavy_work)) {
        gb_heavy_work_refused(&problem, "long spectra");
        ok = false;
    }
    if (ok) {
        reply_spectrum(&r, reply);
    } else {
        gb_reply_problem(reply, &problem);
    }
    gb_params_end(&p);
}
