/*
 * sensitivity_montecarlo.h — "method": "monte-carlo" on /v1/sensitivity:
 * the propagation of distributions of JCGM 101:2008 (core/montecarlo.h)
 * beside the GUM budget.
 *
 * Request fields (POST; GET takes the same names):
 *   method         "gum" (default) or "monte-carlo"
 *   draws          whole number, 100 to the server's --max-draws (default
 *                  100000, capped at --max-draws)
 *   seed           whole number 0 to 2^53 (default 1): the same seed gives
 *                  the same answer on every machine
 *   distributions  {"<input>": "normal" | "rectangular"} per input, keyed by
 *                  the input's field name as given (emissivity,
 *                  reflected_temperature or reflected_radiance, transmittance,
 *                  atmosphere_temperature or path_radiance,
 *                  apparent_temperature or measured_radiance); default normal.
 *                  GET: "emissivity:rectangular,apparent_temperature:normal".
 * The standard uncertainties are the budget's u_<input>: an input with u = 0
 * is held fixed.  draws, seed and distributions without "monte-carlo" ->
 * conflicting_fields.
 *
 * Ownership: the workspace of `draws` doubles is allocated per request by
 * gb_sensitivity_mc_run() and freed before it returns.  Runs of more than
 * GB_SENSITIVITY_MC_LIGHT_DRAWS draws first take a heavy-work slot
 * (heavywork.h), so large runs cannot starve other requests.
 */
#ifndef GREYBODY_SENSITIVITY_MONTECARLO_H
#define GREYBODY_SENSITIVITY_MONTECARLO_H

#include <stdbool.h>
#include <stddef.h>
#include <stdint.h>

#include "heavywork.h"
#include "jsonw.h"
#include "montecarlo.h"
#include "params.h"
#include "scene.h"

#define GB_SENSITIVITY_MC_DEFAULT_DRAWS 100000
#define GB_SENSITIVITY_MC_DEFAULT_SEED 1
/* Runs up to this many draws count as light work (a few milliseconds). */
#define GB_SENSITIVITY_MC_LIGHT_DRAWS 10000

/* The request fields this adds to /v1/sensitivity, for its list of accepted fields. */
#define GB_SENSITIVITY_MC_FIELDS "method", "draws", "seed", "distributions"

typedef struct gb_sensitivity_mc {
    bool enabled; /* method "monte-carlo" */
    size_t draws;
    uint64_t seed;
    gb_monte_carlo_input input; /* distributions and kelvin-sized standard uncertainties */
    const char *names[GB_INPUT_COUNT]; /* the inputs' field names (gb_scene_uncertainty) */
} gb_sensitivity_mc;

/* Reads method, draws, seed and distributions; `u` holds the budget's uncertainties. */
bool gb_sensitivity_mc_read(gb_params *p, size_t max_draws, const gb_scene_uncertainty *u,
                            gb_sensitivity_mc *mc);

/*
 * Runs the propagation.  False with `problem` set on failure: 503 overloaded
 * when no heavy-work slot came free, or the core's status naming the field
 * it concerns.
 */
bool gb_sensitivity_mc_run(const gb_sensitivity_mc *mc, gb_heavy_work *heavy,
                           const gb_band *band, const gb_scene *scene,
                           gb_monte_carlo_result *result, gb_problem *problem);

/* Writes the "monte_carlo" member: temperatures in `unit`, the spread as a difference. */
void gb_sensitivity_mc_write(gb_jw *w, const gb_sensitivity_mc *mc,
                             const gb_monte_carlo_result *result, const gb_scene_uncertainty *u,
                             gb_temperature_unit unit);

#endif
