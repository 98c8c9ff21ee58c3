#include "elementwise.h"

#include <math.h>
#include <stdint.h>
#include <stdlib.h>
#include <string.h>

typedef struct element_error {
    size_t index;
    gb_status status;
    const char *field;
} element_error;

static gb_status run_element(const gb_elementwise *batch, size_t i, double *out, const char **field)
{
    double in[GB_ELEMENTWISE_MAX_INPUTS];
    for (size_t k = 0; k < batch->input_count; k++) {
        in[k] = gb_num_at(batch->inputs[k], i);
    }
    for (size_t k = 0; k < batch->output_count; k++) {
        out[k] = NAN;
    }
    *field = NULL;
    gb_status status = batch->element(batch->context, in, out, field);
    if (status == GB_ERR_NOT_FINITE) {
        /* params let only finite inputs through: a non-finite value can only be an
         * intermediate or result that left the range of a double. */
        status = GB_ERR_RESULT_OVERFLOW;
    }
    if (status == GB_OK) {
        for (size_t k = 0; k < batch->output_count; k++) {
            if (!isfinite(out[k]) && !batch->outputs[k].nullable) {
                status = GB_ERR_RESULT_OVERFLOW;
                *field = NULL;
                break;
            }
        }
    }
    if (status != GB_OK && *field == NULL && batch->field_for != NULL) {
        *field = batch->field_for(batch->context, status);
    }
    return status;
}

static void write_extras(const gb_elementwise *batch, gb_jw *w)
{
    for (size_t k = 0; k < batch->extra_count; k++) {
        gb_jw_kstring(w, batch->extras[k][0], batch->extras[k][1]);
    }
}

static void reply_scalar(const gb_elementwise *batch, gb_reply *reply)
{
    double out[GB_ELEMENTWISE_MAX_OUTPUTS];
    const char *field = NULL;
    gb_status status = run_element(batch, 0, out, &field);
    if (status != GB_OK) {
        gb_problem problem;
        gb_problem_clear(&problem);
        gb_problem_from_status(&problem, status, field, NULL);
        gb_reply_problem(reply, &problem);
        return;
    }
    gb_jw w;
    gb_jw_init(&w, 512);
    gb_jw_object_begin(&w);
    for (size_t k = 0; k < batch->output_count; k++) {
        gb_jw_knumber(&w, batch->outputs[k].name, out[k]);
        if (batch->outputs[k].unit_key != NULL) {
            gb_jw_kstring(&w, batch->outputs[k].unit_key, batch->outputs[k].unit);
        }
    }
    write_extras(batch, &w);
    gb_jw_object_end(&w);
    gb_reply_json(reply, 200, &w);
}

static void reply_arrays(const gb_elementwise *batch, gb_reply *reply)
{
    size_t n = batch->count;
    size_t m = batch->output_count;
    double *columns = NULL;
    unsigned char *failed = NULL;
    element_error *errors = NULL;
    size_t error_count = 0;
    size_t error_capacity = 0;

    if (m > 0 && n > SIZE_MAX / sizeof(double) / m) {
        gb_reply_fail(reply, GB_PROBLEM_INTERNAL, NULL, "Request too large.");
        return;
    }
    columns = malloc(sizeof(double) * m * n + 1);
    failed = calloc(n, 1);
    if (columns == NULL || failed == NULL) {
        free(columns);
        free(failed);
        gb_reply_fail(reply, GB_PROBLEM_INTERNAL, NULL, "Out of memory.");
        return;
    }
    for (size_t i = 0; i < n; i++) {
        double out[GB_ELEMENTWISE_MAX_OUTPUTS];
        const char *field = NULL;
        gb_status status = run_element(batch, i, out, &field);
        if (status != GB_OK) {
            failed[i] = 1;
            if (error_count == error_capacity) {
                size_t capacity = error_capacity ? error_capacity * 2 : 16;
                element_error *grown = realloc(errors, capacity * sizeof *grown);
                if (grown == NULL) {
                    free(columns);
                    free(failed);
                    free(errors);
                    gb_reply_fail(reply, GB_PROBLEM_INTERNAL, NULL, "Out of memory.");
                    return;
                }
                errors = grown;
                error_capacity = capacity;
            }
            errors[error_count++] = (element_error){i, status, field};
            continue;
        }
        for (size_t k = 0; k < m; k++) {
            columns[k * n + i] = out[k];
        }
    }

    gb_jw w;
    gb_jw_init(&w, 64 + n * m * 24 + error_count * 160);
    gb_jw_object_begin(&w);
    for (size_t k = 0; k < m; k++) {
        gb_jw_key(&w, batch->outputs[k].name);
        gb_jw_array_begin(&w);
        const double *column = columns + k * n;
        for (size_t i = 0; i < n && !w.failed; i++) {
            if (failed[i]) {
                gb_jw_null(&w);
            } else {
                gb_jw_number(&w, column[i]); /* NaN of a nullable output -> null */
            }
        }
        gb_jw_array_end(&w);
        if (batch->outputs[k].unit_key != NULL) {
            gb_jw_kstring(&w, batch->outputs[k].unit_key, batch->outputs[k].unit);
        }
    }
    write_extras(batch, &w);
    if (error_count > 0) {
        gb_jw_key(&w, "element_errors");
        gb_jw_array_begin(&w);
    }
    for (size_t e = 0; e < error_count && !w.failed; e++) {
        gb_jw_object_begin(&w);
        gb_jw_kinteger(&w, "index", (long long)errors[e].index);
        gb_jw_kstring(&w, "code", gb_status_name(errors[e].status));
        gb_jw_kstring(&w, "field", errors[e].field);
        gb_jw_kstring(&w, "detail", gb_status_text(errors[e].status));
        gb_jw_object_end(&w);
    }
    if (error_count > 0) {
        gb_jw_array_end(&w);
    }
    gb_jw_object_end(&w);
    free(columns);
    free(failed);
    free(errors);
    gb_reply_json(reply, 200, &w);
}

void gb_elementwise_reply(const gb_elementwise *batch, gb_reply *reply)
{
    if (batch->is_array) {
        reply_arrays(batch, reply);
    } else {
        reply_scalar(batch, reply);
    }
}
