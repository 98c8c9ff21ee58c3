/*
 * handlers_frames.h — the frame form (frames.h) of the conversions that take
 * whole frames: each reads its scalar query parameters, fills in the
 * gb_frame's inputs and runs the core (frame.h) over it.
 */
#ifndef GREYBODY_HANDLERS_FRAMES_H
#define GREYBODY_HANDLERS_FRAMES_H

#include <jansson.h>
#include <stdbool.h>

#include "config.h"
#include "frame.h"
#include "problem.h"

typedef struct gb_frame_call {
    const gb_config *config;
    json_t *query;      /* the query arguments left after the frame's own (strings) */
    const char *signal; /* the quantity the first plane holds, e.g. "apparent_temperature" */
    gb_frame *frame;    /* count, signal, emissivity_map, temperature, pixel_status are set */
} gb_frame_call;

/* Converts the frame, or sets `problem` and returns false. */
typedef bool (*gb_frame_convert)(gb_frame_call *call, gb_problem *problem);

bool gb_convert_frame_corrected(gb_frame_call *call, gb_problem *problem);
bool gb_convert_frame_band_temperature(gb_frame_call *call, gb_problem *problem);
bool gb_convert_frame_brightness(gb_frame_call *call, gb_problem *problem);
bool gb_convert_frame_calibration_apply(gb_frame_call *call, gb_problem *problem);

#endif
