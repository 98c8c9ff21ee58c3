#include "frames.h"

#include <errno.h>
#include <jansson.h>
#include <math.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <strings.h>

#include "handlers.h"
#include "handlers_frames.h"
#include "params.h"
#include "units.h"

#define FLOAT_BYTES 4u
#define SIGNAL_MARKER "frame"
#define MAP_MARKER "map"

/* Status-plane codes (frames.h). */
enum { PIXEL_ANSWERED = 0, PIXEL_INPUT_OUT_OF_DOMAIN = 1, PIXEL_NET_SIGNAL = 2,
       PIXEL_OUT_OF_RANGE = 3 };

/* The endpoints that take frames: their JSON handler names them. */
typedef struct frame_endpoint {
    gb_handler json_handler;
    const char *const *signals; /* what the first plane may hold; [0] is the default */
    gb_frame_convert convert;
} frame_endpoint;

static const char *const corrected_signals[] = {"apparent_temperature", "measured_radiance",
                                                NULL};
static const char *const band_signals[] = {"radiance", "exitance", NULL};
static const char *const brightness_signals[] = {"radiance", NULL};
static const char *const calibration_signals[] = {"signal", NULL};

static const frame_endpoint endpoints[] = {
    {gb_handle_corrected_temperature, corrected_signals, gb_convert_frame_corrected},
    {gb_handle_band_temperature, band_signals, gb_convert_frame_band_temperature},
    {gb_handle_brightness_temperature, brightness_signals, gb_convert_frame_brightness},
    {gb_handle_calibration_apply, calibration_signals, gb_convert_frame_calibration_apply},
};

static const frame_endpoint *endpoint_for(const gb_route *route)
{
    for (size_t i = 0; route != NULL && i < sizeof endpoints / sizeof endpoints[0]; i++) {
        if (route->handler == endpoints[i].json_handler) {
            return &endpoints[i];
        }
    }
    return NULL;
}

/* "application/octet-stream", parameters ignored, any case. */
static bool is_frame_media_type(const char *value)
{
    static const char frame[] = GB_CONTENT_FRAME;
    if (value == NULL) {
        return false;
    }
    while (*value == ' ' || *value == '\t') {
        value++;
    }
    if (strncasecmp(value, frame, sizeof frame - 1) != 0) {
        return false;
    }
    value += sizeof frame - 1;
    while (*value == ' ' || *value == '\t') {
        value++;
    }
    return *value == '\0' || *value == ';';
}

bool gb_frames_accepts(const gb_route *route, const char *content_type)
{
    return endpoint_for(route) != NULL && is_frame_media_type(content_type);
}

/* ---- the frame's own query parameters ---------------------------------------- */

typedef struct frame_shape {
    const char *signal;    /* the first plane's quantity */
    bool emissivity_map;   /* a second plane */
    size_t width, height;  /* 0: not given */
    bool status_plane;
} frame_shape;

static const char *query_text(json_t *query, const char *name)
{
    json_t *value = json_object_get(query, name);
    return json_is_string(value) ? json_string_value(value) : NULL;
}

static bool take_dimension(json_t *query, const char *name, size_t *out, gb_problem *problem)
{
    const char *text = query_text(query, name);
    *out = 0;
    if (text == NULL) {
        return true;
    }
    char *end = NULL;
    errno = 0;
    unsigned long long value = strtoull(text, &end, 10);
    if (text[0] < '0' || text[0] > '9' || *end != '\0' || errno == ERANGE || value == 0 ||
        value > SIZE_MAX) {
        gb_problem_set(problem, GB_PROBLEM_INVALID_QUERY, name,
                       "\"%s\" must be a positive whole number of pixels.", name);
        return false;
    }
    *out = (size_t)value;
    json_object_del(query, name);
    return true;
}

/* Which quantity the first plane holds: the signal named "frame", else the default. */
static bool take_signal(json_t *query, const char *const *signals, const char **signal,
                        gb_problem *problem)
{
    *signal = signals[0];
    bool marked = false;
    for (size_t i = 0; signals[i] != NULL; i++) {
        const char *text = query_text(query, signals[i]);
        if (json_object_get(query, signals[i]) == NULL) {
            continue;
        }
        if (text == NULL || strcmp(text, SIGNAL_MARKER) != 0) {
            gb_problem_set(problem, GB_PROBLEM_CONFLICTING_FIELDS, signals[i],
                           "In a frame request the body holds the %s values: give "
                           "%s=frame or leave it out.",
                           signals[i], signals[i]);
            return false;
        }
        if (marked) {
            gb_problem_set(problem, GB_PROBLEM_CONFLICTING_FIELDS, signals[i],
                           "Only one quantity can be the frame; \"%s\" and \"%s\" both are.",
                           *signal, signals[i]);
            return false;
        }
        marked = true;
        *signal = signals[i];
    }
    if (marked) {
        json_object_del(query, *signal);
    }
    return true;
}

static bool take_shape(json_t *query, const frame_endpoint *endpoint, frame_shape *shape,
                       gb_problem *problem)
{
    memset(shape, 0, sizeof *shape);
    if (!take_signal(query, endpoint->signals, &shape->signal, problem) ||
        !take_dimension(query, "width", &shape->width, problem) ||
        !take_dimension(query, "height", &shape->height, problem)) {
        return false;
    }
    const char *map = query_text(query, "emissivity");
    if (map != NULL && strcmp(map, MAP_MARKER) == 0) {
        shape->emissivity_map = true;
        json_object_del(query, "emissivity");
    }
    const char *status = query_text(query, "status_plane");
    if (status != NULL) {
        if (strcmp(status, "true") != 0 && strcmp(status, "false") != 0) {
            gb_problem_set(problem, GB_PROBLEM_INVALID_QUERY, "status_plane",
                           "\"status_plane\" is true or false.");
            return false;
        }
        shape->status_plane = strcmp(status, "true") == 0;
        json_object_del(query, "status_plane");
    }
    return true;
}

/* ---- sizes and pixels ---------------------------------------------------------- */

static bool check_size(const gb_config *config, const frame_shape *shape, size_t length,
                       size_t *pixels, gb_problem *problem)
{
    size_t planes = shape->emissivity_map ? 2 : 1;
    if (length == 0) {
        gb_problem_set(problem, GB_PROBLEM_EMPTY_ARRAY, "body",
                       "The body holds no pixels; send float32 values.");
        return false;
    }
    if (length % FLOAT_BYTES != 0) {
        gb_problem_set(problem, GB_PROBLEM_ARRAY_LENGTH_MISMATCH, "body",
                       "The body holds %zu bytes, not a whole number of float32 values "
                       "(4 bytes each).",
                       length);
        return false;
    }
    size_t values = length / FLOAT_BYTES;
    if (values % planes != 0) {
        gb_problem_set(problem, GB_PROBLEM_ARRAY_LENGTH_MISMATCH, "emissivity",
                       "With emissivity=map the body holds two planes of equal size; %zu "
                       "values cannot be split in two.",
                       values);
        return false;
    }
    *pixels = values / planes;
    if (*pixels > config->max_array) {
        gb_problem_set(problem, GB_PROBLEM_ARRAY_TOO_LONG, "body",
                       "The frame has %zu pixels; this server accepts at most %zu.", *pixels,
                       config->max_array);
        return false;
    }
    if (shape->width != 0 && shape->height != 0 &&
        (shape->width > *pixels / shape->height || shape->width * shape->height != *pixels)) {
        gb_problem_set(problem, GB_PROBLEM_ARRAY_LENGTH_MISMATCH, "height",
                       "width x height = %zu x %zu, but the body holds %zu pixels per plane.",
                       shape->width, shape->height, *pixels);
        return false;
    }
    if (shape->width != 0 && *pixels % shape->width != 0) {
        gb_problem_set(problem, GB_PROBLEM_ARRAY_LENGTH_MISMATCH, "width",
                       "%zu pixels per plane do not make whole rows of width %zu.", *pixels,
                       shape->width);
        return false;
    }
    if (shape->height != 0 && *pixels % shape->height != 0) {
        gb_problem_set(problem, GB_PROBLEM_ARRAY_LENGTH_MISMATCH, "height",
                       "%zu pixels per plane do not make %zu whole rows.", *pixels,
                       shape->height);
        return false;
    }
    return true;
}

/* Little-endian float32 at `bytes`, whatever the host's byte order. */
static float read_float(const unsigned char *bytes)
{
    uint32_t bits = (uint32_t)bytes[0] | (uint32_t)bytes[1] << 8 | (uint32_t)bytes[2] << 16 |
                    (uint32_t)bytes[3] << 24;
    float value;
    memcpy(&value, &bits, sizeof value);
    return value;
}

static void write_float(unsigned char *bytes, float value)
{
    uint32_t bits;
    memcpy(&bits, &value, sizeof bits);
    bytes[0] = (unsigned char)bits;
    bytes[1] = (unsigned char)(bits >> 8);
    bytes[2] = (unsigned char)(bits >> 16);
    bytes[3] = (unsigned char)(bits >> 24);
}

/* Decodes one plane in place into host floats; a NaN or infinity is refused by name. */
static bool decode_plane(unsigned char *bytes, size_t pixels, const char *field, size_t width,
                         gb_problem *problem)
{
    for (size_t i = 0; i < pixels; i++) {
        float value = read_float(bytes + i * FLOAT_BYTES);
        if (!isfinite(value)) {
            if (width != 0) {
                gb_problem_set(problem, GB_PROBLEM_NOT_FINITE, field,
                               "Pixel %zu (x %zu, y %zu) of \"%s\" is not a finite number.", i,
                               i % width, i / width, field);
            } else {
                gb_problem_set(problem, GB_PROBLEM_NOT_FINITE, field,
                               "Pixel %zu of \"%s\" is not a finite number.", i, field);
            }
            return false;
        }
        memcpy(bytes + i * FLOAT_BYTES, &value, sizeof value);
    }
    return true;
}

static void encode_plane(unsigned char *bytes, size_t pixels)
{
    for (size_t i = 0; i < pixels; i++) {
        float value;
        memcpy(&value, bytes + i * FLOAT_BYTES, sizeof value);
        write_float(bytes + i * FLOAT_BYTES, value);
    }
}

static unsigned char pixel_code(unsigned char status)
{
    switch ((gb_status)status) {
    case GB_OK: return PIXEL_ANSWERED;
    case GB_ERR_NET_SIGNAL_NOT_POSITIVE: return PIXEL_NET_SIGNAL;
    case GB_ERR_RADIANCE_OUT_OF_RANGE:
    case GB_ERR_RESULT_OVERFLOW: return PIXEL_OUT_OF_RANGE;
    default: return PIXEL_INPUT_OUT_OF_DOMAIN;
    }
}

/* ---- one request ----------------------------------------------------------------- */

static void add_header(gb_reply *reply, const char *name, const char *value)
{
    for (size_t i = 0; i < GB_REPLY_EXTRA_HEADERS; i++) {
        if (reply->extra_headers[i].name == NULL) {
            reply->extra_headers[i].name = name;
            snprintf(reply->extra_headers[i].value, sizeof reply->extra_headers[i].value, "%s",
                     value);
            return;
        }
    }
}

static void describe_answer(gb_reply *reply, const gb_frame *frame)
{
    char counts[2][24];
    snprintf(counts[0], sizeof counts[0], "%zu", frame->unresolved);
    snprintf(counts[1], sizeof counts[1], "%zu", frame->count);
    add_header(reply, "Greybody-Unresolved-Pixels", counts[0]);
    add_header(reply, "Greybody-Frame-Pixels", counts[1]);
    add_header(reply, "Greybody-Temperature-Unit", gb_temperature_unit_symbol(frame->unit));
    /* Browsers show a cross-origin caller only the headers named here. */
    add_header(reply, "Access-Control-Expose-Headers",
               "Greybody-Unresolved-Pixels, Greybody-Frame-Pixels, Greybody-Temperature-Unit");
}

/*
 * Decodes, converts and encodes in the body's own memory.  With a status
 * plane the buffer first grows to hold one byte per pixel after the planes;
 * those bytes then move up behind the temperatures.
 */
static bool convert(const gb_config *config, const frame_endpoint *endpoint, json_t *query,
                    const frame_shape *shape, unsigned char **buffer, size_t length,
                    size_t pixels, size_t *answer_length, gb_reply *reply, gb_problem *problem)
{
    size_t plane_bytes = pixels * FLOAT_BYTES;
    if (shape->status_plane) {
        unsigned char *grown = realloc(*buffer, length + pixels);
        if (grown == NULL) {
            gb_problem_set(problem, GB_PROBLEM_INTERNAL, NULL,
                           "Out of memory for the status plane.");
            return false;
        }
        *buffer = grown;
    }
    unsigned char *bytes = *buffer;
    if (!decode_plane(bytes, pixels, shape->signal, shape->width, problem) ||
        (shape->emissivity_map &&
         !decode_plane(bytes + plane_bytes, pixels, "emissivity", shape->width, problem))) {
        return false;
    }
    /* The decoded planes are host floats now; the answer overwrites the first. */
    float *signal = (float *)(void *)bytes;
    unsigned char *statuses = shape->status_plane ? bytes + length : NULL;
    gb_frame frame = {
        .count = pixels,
        .signal = signal,
        .radiance_scale = 1.0,
        .emissivity_map = shape->emissivity_map ? (const float *)(void *)(bytes + plane_bytes)
                                                : NULL,
        .temperature = signal,
        .pixel_status = statuses,
    };
    gb_frame_call call = {config, query, shape->signal, &frame};
    if (!endpoint->convert(&call, problem)) {
        return false;
    }
    encode_plane(bytes, pixels);
    *answer_length = plane_bytes;
    if (statuses != NULL) {
        for (size_t i = 0; i < pixels; i++) {
            statuses[i] = pixel_code(statuses[i]);
        }
        memmove(bytes + plane_bytes, statuses, pixels);
        *answer_length += pixels;
    }
    describe_answer(reply, &frame);
    return true;
}

void gb_frames_serve(gb_context *context, struct MHD_Connection *connection,
                     const gb_route *route, char **body, size_t length, bool body_too_large,
                     gb_heavy_work *heavy, gb_reply *reply)
{
    gb_problem problem;
    gb_problem_clear(&problem);
    const frame_endpoint *endpoint = endpoint_for(route);
    unsigned char *buffer = (unsigned char *)*body;
    *body = NULL; /* ours now: freed here or handed to the reply */
    json_t *query = NULL;
    frame_shape shape;
    size_t pixels = 0, answer_length = 0;

    if (body_too_large) {
        gb_problem_set(&problem, GB_PROBLEM_BODY_TOO_LARGE, NULL,
                       "The request body is larger than %zu bytes.",
                       context->config.max_body_bytes);
    } else if (endpoint != NULL && (query = gb_params_from_query(connection, &problem)) != NULL &&
               take_shape(query, endpoint, &shape, &problem) &&
               check_size(&context->config, &shape, buffer == NULL ? 0 : length, &pixels,
                          &problem)) {
        if (length > GB_LARGE_BODY_BYTES && !gb_heavy_work_enter(heavy)) {
            gb_heavy_work_refused(&problem, "frames");
        } else if (convert(&context->config, endpoint, query, &shape, &buffer, length, pixels,
                           &answer_length, reply, &problem)) {
            gb_reply_owned(reply, 200, GB_CONTENT_FRAME, (char *)buffer, answer_length);
            buffer = NULL;
        }
    }
    if (gb_problem_is_set(&problem)) {
        gb_reply_problem(reply, &problem);
    }
    json_decref(query);
    free(buffer);
}
