#include "sensitivity_montecarlo.h"

#include <math.h>
#include <stdarg.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

/* Seeds are whole numbers a JSON double holds exactly. */
#define SEED_MAX 9007199254740992.0 /* 2^53 */

static const char *const method_names[] = {"gum", "monte-carlo", NULL};
static const char *const law_names[] = {"none", "normal", "rectangular"};

static bool fail_status(gb_problem *problem, gb_status status, const char *field,
                        const char *detail, ...) __attribute__((format(printf, 4, 5)));

static bool fail_status(gb_problem *problem, gb_status status, const char *field,
                        const char *detail, ...)
{
    if (!gb_problem_is_set(problem)) {
        char text[GB_PROBLEM_DETAIL_MAX];
        va_list args;
        va_start(args, detail);
        vsnprintf(text, sizeof text, detail, args);
        va_end(args);
        gb_problem_from_status(problem, status, field, text);
    }
    return false;
}

static bool whole_number(gb_params *p, const char *name, double fallback, double max,
                         double *value)
{
    gb_num num;
    if (!gb_params_number(p, name, 0, fallback, &num)) {
        return false;
    }
    if (!(num.scalar >= 0.0 && num.scalar <= max && floor(num.scalar) == num.scalar)) {
        return gb_params_fail(p, GB_PROBLEM_WRONG_TYPE, name,
                              "\"%s\" must be a whole number from 0 to %.17g.", name, max);
    }
    *value = num.scalar;
    return true;
}

/* One "<input>": "<law>" pair; the input is named as the budget names it. */
static bool read_law(gb_params *p, const gb_scene_uncertainty *u, const char *input,
                     const char *law, gb_sensitivity_mc *mc)
{
    char field[GB_PROBLEM_FIELD_MAX];
    snprintf(field, sizeof field, "distributions.%.60s", input);
    for (size_t i = 0; i < GB_INPUT_COUNT; i++) {
        if (strcmp(input, u->names[i]) != 0) {
            continue;
        }
        if (law != NULL && strcmp(law, "normal") == 0) {
            mc->input.distribution[i] = GB_DISTRIBUTION_NORMAL;
            return true;
        }
        if (law != NULL && strcmp(law, "rectangular") == 0) {
            mc->input.distribution[i] = GB_DISTRIBUTION_RECTANGULAR;
            return true;
        }
        return fail_status(p->problem, GB_ERR_DISTRIBUTION_UNKNOWN, field,
                           "\"%s\" must be \"normal\" or \"rectangular\".", field);
    }
    return gb_params_fail(p, GB_PROBLEM_UNKNOWN_FIELD, field,
                          "\"%s\" is not an input of this request; distributions are keyed by "
                          "%s, %s, %s, %s or %s.",
                          field, u->names[GB_INPUT_EMISSIVITY], u->names[GB_INPUT_REFLECTED],
                          u->names[GB_INPUT_TRANSMITTANCE], u->names[GB_INPUT_ATMOSPHERE],
                          u->names[GB_INPUT_SIGNAL]);
}

/* GET form: "emissivity:rectangular,apparent_temperature:normal". */
static bool read_law_list(gb_params *p, const gb_scene_uncertainty *u, const char *text,
                          gb_sensitivity_mc *mc)
{
    char copy[512];
    if (strlen(text) >= sizeof copy) {
        return gb_params_fail(p, GB_PROBLEM_INVALID_QUERY, "distributions",
                              "\"distributions\" is too long.");
    }
    memcpy(copy, text, strlen(text) + 1);
    for (char *item = strtok(copy, ","); item != NULL; item = strtok(NULL, ",")) {
        char *colon = strchr(item, ':');
        if (colon == NULL) {
            return gb_params_fail(p, GB_PROBLEM_INVALID_QUERY, "distributions",
                                  "\"distributions\" must be a comma list of input:law, such as "
                                  "emissivity:rectangular.");
        }
        *colon = '\0';
        if (!read_law(p, u, item, colon + 1, mc)) {
            return false;
        }
    }
    return true;
}

static bool read_laws(gb_params *p, const gb_scene_uncertainty *u, gb_sensitivity_mc *mc)
{
    json_t *value = json_object_get(p->root, "distributions");
    if (value == NULL) {
        return true;
    }
    if (p->from_query && json_is_string(value)) {
        return read_law_list(p, u, json_string_value(value), mc);
    }
    if (!json_is_object(value)) {
        return gb_params_fail(p, GB_PROBLEM_WRONG_TYPE, "distributions",
                              "\"distributions\" must be an object such as "
                              "{\"emissivity\": \"rectangular\"}.");
    }
    const char *key;
    json_t *law;
    json_object_foreach(value, key, law)
    {
        if (!read_law(p, u, key, json_is_string(law) ? json_string_value(law) : NULL, mc)) {
            return false;
        }
    }
    return true;
}

bool gb_sensitivity_mc_read(gb_params *p, size_t max_draws, const gb_scene_uncertainty *u,
                            gb_sensitivity_mc *mc)
{
    static const char *const options[] = {"draws", "seed", "distributions", NULL};
    size_t method = 0;
    memset(mc, 0, sizeof *mc);
    if (!gb_params_choice(p, "method", method_names, 0, &method)) {
        return false;
    }
    mc->enabled = method == 1;
    if (!mc->enabled) {
        for (size_t i = 0; options[i] != NULL; i++) {
            if (gb_params_has(p, options[i])) {
                return gb_params_fail(p, GB_PROBLEM_CONFLICTING_FIELDS, options[i],
                                      "\"%s\" applies only with \"method\": \"monte-carlo\".",
                                      options[i]);
            }
        }
        return true;
    }
    double draws = 0.0, seed = 0.0;
    double fallback = GB_SENSITIVITY_MC_DEFAULT_DRAWS < max_draws
                          ? (double)GB_SENSITIVITY_MC_DEFAULT_DRAWS
                          : (double)max_draws;
    if (!whole_number(p, "draws", fallback, SEED_MAX, &draws) ||
        !whole_number(p, "seed", GB_SENSITIVITY_MC_DEFAULT_SEED, SEED_MAX, &seed)) {
        return false;
    }
    if (draws < GB_MONTE_CARLO_MIN_DRAWS || draws > (double)max_draws) {
        return fail_status(p->problem, GB_ERR_DRAW_COUNT, "draws",
                           "\"draws\" must be from %d to %zu (this server's --max-draws).",
                           GB_MONTE_CARLO_MIN_DRAWS, max_draws);
    }
    mc->draws = (size_t)draws;
    mc->seed = (uint64_t)seed;
    for (size_t i = 0; i < GB_INPUT_COUNT; i++) {
        mc->input.distribution[i] = GB_DISTRIBUTION_NORMAL;
        mc->input.standard_uncertainty[i] = u->kelvin[i];
        mc->names[i] = u->names[i];
    }
    return read_laws(p, u, mc);
}

/* The input whose law is most likely to leave its domain: the largest u against its value. */
static size_t widest_input(const gb_sensitivity_mc *mc, const gb_scene *scene)
{
    const double centre[GB_INPUT_COUNT] = {scene->emissivity, scene->reflected.value,
                                           scene->transmittance, scene->atmosphere.value,
                                           scene->signal.value};
    size_t widest = GB_INPUT_EMISSIVITY;
    double widest_share = -1.0;
    for (size_t i = 0; i < GB_INPUT_COUNT; i++) {
        double share = mc->input.standard_uncertainty[i] / fmax(fabs(centre[i]), 1e-300);
        if (share > widest_share) {
            widest_share = share;
            widest = i;
        }
    }
    return widest;
}

bool gb_sensitivity_mc_run(const gb_sensitivity_mc *mc, gb_heavy_work *heavy,
                           const gb_band *band, const gb_scene *scene,
                           gb_monte_carlo_result *result, gb_problem *problem)
{
    if (mc->draws > GB_SENSITIVITY_MC_LIGHT_DRAWS && !gb_heavy_work_enter(heavy)) {
        gb_heavy_work_refused(problem, "Monte Carlo runs");
        return false;
    }
    double *workspace = malloc(mc->draws * sizeof *workspace);
    if (workspace == NULL) {
        gb_problem_set(problem, GB_PROBLEM_INTERNAL, "draws", "Out of memory for %zu draws.",
                       mc->draws);
        return false;
    }
    gb_status status = gb_monte_carlo(band, scene, &mc->input, mc->draws, mc->seed, workspace,
                                      result);
    free(workspace);
    switch (status) {
    case GB_OK: return true;
    case GB_ERR_UNCERTAINTY_DOMAIN: {
        char field[64];
        snprintf(field, sizeof field, "u_%s", mc->names[widest_input(mc, scene)]);
        return fail_status(problem, status, field,
                           "A distribution lies almost wholly outside its input's domain "
                           "(emissivity and transmittance in (0, 1], temperatures above 0 K); "
                           "reduce that standard uncertainty.");
    }
    case GB_ERR_NET_SIGNAL_NOT_POSITIVE:
        return fail_status(problem, status, "draws",
                           "Fewer than %d draws had a solution: for most draws the reflected "
                           "and atmospheric terms exceed the signal. Check the inputs and their "
                           "uncertainties.",
                           GB_MONTE_CARLO_MIN_DRAWS);
    default:
        gb_problem_from_status(problem, status, "method", NULL);
        return false;
    }
}

void gb_sensitivity_mc_write(gb_jw *w, const gb_sensitivity_mc *mc,
                             const gb_monte_carlo_result *result, const gb_scene_uncertainty *u,
                             gb_temperature_unit unit)
{
    double mean = NAN, low = NAN, high = NAN, spread = NAN;
    gb_temperature_from_kelvin(result->mean_k, unit, &mean);
    gb_temperature_from_kelvin(result->coverage_low_k, unit, &low);
    gb_temperature_from_kelvin(result->coverage_high_k, unit, &high);
    gb_temperature_difference_from_kelvin(result->standard_deviation_k, unit, &spread);
    gb_jw_key(w, "monte_carlo");
    gb_jw_object_begin(w);
    gb_jw_knumber(w, "mean", mean);
    gb_jw_knumber(w, "standard_deviation", spread);
    gb_jw_key(w, "coverage_interval");
    gb_jw_array_begin(w);
    gb_jw_number(w, low);
    gb_jw_number(w, high);
    gb_jw_array_end(w);
    gb_jw_knumber(w, "coverage_probability", GB_MONTE_CARLO_COVERAGE);
    gb_jw_kinteger(w, "draws", (long long)mc->draws);
    gb_jw_kinteger(w, "unsolvable_draws", (long long)result->unsolvable_draws);
    gb_jw_kinteger(w, "seed", (long long)mc->seed);
    gb_jw_key(w, "distributions");
    gb_jw_object_begin(w);
    for (size_t i = 0; i < GB_INPUT_COUNT; i++) {
        if (u->given[i] > 0.0) {
            gb_jw_kstring(w, u->names[i], law_names[mc->input.distribution[i]]);
        }
    }
    gb_jw_object_end(w);
    gb_jw_object_end(w);
}
