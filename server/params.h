/*
 * params.h — a request's fields as typed inputs.
 *
 * Both request forms become one JSON object before a handler sees them: a POST
 * body is parsed as is (gb_params_parse_body); a GET query string becomes an
 * object of strings (gb_params_from_query), and the readers below parse those
 * strings (scalars only; bands as "lo,hi").  Every reader either succeeds or
 * records one problem naming the field and returns false; once a problem is
 * recorded every later reader returns false at once, so handlers can chain
 * them with &&.
 *
 * Ownership: arrays handed out in gb_num and gb_band point into memory owned
 * by the gb_params; it is freed by gb_params_end().  The root object is
 * borrowed.
 */
#ifndef GREYBODY_PARAMS_H
#define GREYBODY_PARAMS_H

#include <jansson.h>
#include <stdbool.h>
#include <stddef.h>

#include "band.h"
#include "problem.h"
#include "units.h"

struct MHD_Connection;

/* A numeric input: one number, or an array of them. */
typedef struct gb_num {
    const char *name;
    bool present;         /* given in the request (otherwise `scalar` holds the default) */
    bool is_array;        /* given as a JSON array */
    size_t count;         /* 1 for a scalar */
    const double *values; /* is_array: `count` values (owned by the gb_params) */
    double scalar;        /* !is_array: the value */
} gb_num;

static inline double gb_num_at(const gb_num *num, size_t i)
{
    if (!num->is_array) {
        return num->scalar;
    }
    return num->values[num->count == 1 ? 0 : i];
}

#define GB_PARAMS_MAX_ALLOCATIONS 32

typedef struct gb_params {
    json_t *root;
    bool from_query;
    size_t max_array;
    gb_problem *problem;
    void *allocations[GB_PARAMS_MAX_ALLOCATIONS];
    size_t allocation_count;
} gb_params;

/* Reader flags. */
#define GB_REQUIRED 1u  /* missing -> missing_field */
#define GB_ARRAY_OK 2u  /* an array is accepted (POST only) */

/* Deepest JSON nesting accepted in a body by default (checked before parsing). */
#define GB_PARAMS_MAX_DEPTH 32

/*
 * Parses a POST body: nesting depth, then jansson with duplicate keys rejected
 * and integers read as reals.  NULL and a problem (malformed_json,
 * not_an_object, not_finite naming the field) on failure; else a new object
 * the caller must json_decref().
 */
json_t *gb_params_parse_body(const char *body, size_t length, gb_problem *problem);
/* The same with a nesting limit of `max_depth` (--max-depth) instead of GB_PARAMS_MAX_DEPTH. */
json_t *gb_params_parse_body_within(const char *body, size_t length, unsigned max_depth,
                                    gb_problem *problem);

/*
 * The query arguments of a GET request as an object of strings.  A parameter
 * given twice or without a value -> invalid_query.  NULL and a problem on
 * failure; else a new object the caller must json_decref().
 */
json_t *gb_params_from_query(struct MHD_Connection *connection, gb_problem *problem);

/*
 * One decoded query argument into `object` (what gb_params_from_query does for
 * each; exposed so the query path can be exercised without a connection).
 * `value` NULL (a key without "=") or a key given twice -> invalid_query.
 */
bool gb_params_query_put(json_t *object, const char *key, const char *value,
                         gb_problem *problem);

/*
 * Starts reading `root`.  `allowed` is a NULL-terminated list of the field
 * names the endpoint accepts; any other field -> unknown_field naming it.
 * In query form "band_wavenumber" is accepted wherever "band" is.
 */
bool gb_params_begin(gb_params *params, json_t *root, bool from_query, size_t max_array,
                     const char *const *allowed, gb_problem *problem);
void gb_params_end(gb_params *params);

bool gb_params_ok(const gb_params *params);
bool gb_params_has(const gb_params *params, const char *name);

/*
 * Exactly one of `names` (NULL-terminated) present: *which = its index.
 * Two present -> conflicting_fields; none -> missing_field if `required`,
 * else *which = (size_t)-1.
 */
bool gb_params_one_of(gb_params *params, const char *const *names, bool required, size_t *which);

/* A number (or array when GB_ARRAY_OK); absent and not required -> `fallback`. */
bool gb_params_number(gb_params *params, const char *name, unsigned flags, double fallback,
                      gb_num *out);

/* A list of numbers (a JSON array, or "a,b,c" in query form); absent -> the fallback list. */
bool gb_params_number_list(gb_params *params, const char *name, const double *fallback,
                           size_t fallback_count, const double **values, size_t *count);

/* temperature_unit: "K" (default), "C", "F". */
bool gb_params_temperature_unit(gb_params *params, gb_temperature_unit *unit);
/* wavelength_unit: "um" (default), "nm", "m"; *present tells whether it was given. */
bool gb_params_wavelength_unit(gb_params *params, gb_wavelength_unit *unit, bool *present);

/* A string out of `choices` (NULL-terminated); absent -> `fallback` index. */
bool gb_params_choice(gb_params *params, const char *name, const char *const *choices,
                      size_t fallback, size_t *index);

/*
 * band: {"wavelength": [lo, hi]}, {"wavenumber": [lo, hi]},
 * {"response": {"wavelength": [...], "value": [...]}}, {"total": true} or
 * {"preset": "name"} (a band of the presets folder, presets.h; an unknown
 * name -> 400 invalid_band naming "band"); in query form band=lo,hi (um),
 * band=total, band=preset:name or band_wavenumber=lo,hi.
 * Absent -> missing_field if required, else the 8-14 um default.
 * The limits are checked by the core (gb_band_validate) -> 422 naming "band".
 * A preset band's response arrays belong to the installed presets (they live
 * until the process ends).
 */
bool gb_params_band(gb_params *params, bool required, gb_band *band, bool *present);

/*
 * One band given as `value` (a member of a list such as "bands"), read as
 * above: an object, or in query form the text "lo,hi", "total" or
 * "preset:name"; problems name `field`.
 */
bool gb_params_band_value(gb_params *params, const char *field, json_t *value, gb_band *band);

/* True for the statuses of an invalid band (gb_band_validate): the band is the field to blame. */
bool gb_params_is_band_status(gb_status status);

/*
 * The common length of the given inputs: arrays pair element-wise, scalars and
 * length-1 arrays broadcast.  *is_array tells whether any input was an array.
 * Different lengths -> array_length_mismatch naming the first odd one out.
 */
bool gb_params_broadcast(gb_params *params, const gb_num *const *inputs, size_t input_count,
                         size_t *count, bool *is_array);

/* Records a problem (for checks made by handlers) and returns false. */
bool gb_params_fail(gb_params *params, gb_problem_kind kind, const char *field,
                    const char *detail, ...) __attribute__((format(printf, 4, 5)));
bool gb_params_fail_status(gb_params *params, gb_status status, const char *field);

#endif
