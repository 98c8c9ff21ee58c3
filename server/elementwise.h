/*
 * elementwise.h — element-wise evaluation of a conversion over broadcast inputs,
 * written straight into the reply.
 *
 * A handler declares its numeric inputs (gb_num, already read by params),
 * its outputs, and an element function computing one element's outputs from
 * one element's inputs.  gb_elementwise_reply() runs the function over every
 * element and writes the response:
 *   scalar request: {"out1": x, "out1_unit": "...", ..., extras}; a failing
 *     element becomes a 422 (or 400) problem naming the responsible field;
 *   array request:  {"out1": [x, null, ...], ..., extras, "element_errors":
 *     [{"index": i, "code": ..., "field": ..., "detail": ...}]} with 200;
 *     element_errors is present only when some element failed.
 * An output that comes out non-finite is the element's result_overflow,
 * except for `nullable` outputs, which are written as null.
 */
#ifndef GREYBODY_ELEMENTWISE_H
#define GREYBODY_ELEMENTWISE_H

#include <stdbool.h>
#include <stddef.h>

#include "params.h"
#include "reply.h"
#include "status.h"

#define GB_ELEMENTWISE_MAX_INPUTS 8
#define GB_ELEMENTWISE_MAX_OUTPUTS 8
#define GB_ELEMENTWISE_MAX_EXTRAS 4

typedef struct gb_output {
    const char *name;
    const char *unit_key; /* sibling key for the unit, or NULL */
    const char *unit;
    bool nullable;        /* NaN means "no value" (null) rather than an error */
} gb_output;

/*
 * Computes element outputs `out` from element inputs `in` (in the order of
 * gb_elementwise.inputs).  On failure returns the core status and may set *field to
 * the responsible input; otherwise gb_elementwise.field_for decides.
 */
typedef gb_status (*gb_element_fn)(const void *context, const double *in, double *out,
                                   const char **field);
typedef const char *(*gb_field_fn)(const void *context, gb_status status);

typedef struct gb_elementwise {
    const gb_num *inputs[GB_ELEMENTWISE_MAX_INPUTS];
    size_t input_count;
    gb_output outputs[GB_ELEMENTWISE_MAX_OUTPUTS];
    size_t output_count;
    const char *extras[GB_ELEMENTWISE_MAX_EXTRAS][2]; /* string members written after the outputs */
    size_t extra_count;
    size_t count;  /* elements (from gb_params_broadcast) */
    bool is_array; /* write arrays and element_errors */
    gb_element_fn element;
    gb_field_fn field_for;
    const void *context;
} gb_elementwise;

void gb_elementwise_reply(const gb_elementwise *batch, gb_reply *reply);

#endif
