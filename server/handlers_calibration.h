/*
 * handlers_calibration.h — what the calibration handlers share with the frame
 * form of /v1/calibration/apply (handlers_frames.c).
 */
#ifndef GREYBODY_HANDLERS_CALIBRATION_H
#define GREYBODY_HANDLERS_CALIBRATION_H

#include <jansson.h>
#include <stdbool.h>
#include <stddef.h>

#include "calibration.h"
#include "params.h"

/*
 * Reads and checks the request's `calibration` object (in a query or CSV row:
 * its JSON text, then *owned holds the parsed copy), or records a problem
 * naming calibration or calibration.<member> and returns false.  `inner`
 * reads the object and owns the band's arrays: the caller ends it
 * (gb_params_end) and json_decref's *owned, whatever the result.
 */
bool gb_read_calibration(gb_params *p, gb_params *inner, size_t max_array, json_t **owned,
                         gb_calibration *c);

#endif
