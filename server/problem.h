/*
 * problem.h — RFC 9457 problem details, and the one place where every error
 * is classified.
 *
 * Two tables live in problem.c: core gb_status -> HTTP status and title (the
 * problem `code` is gb_status_name()), and the server's own problems (bad
 * JSON, unknown field, 404, 413, ...) -> code, HTTP status and title.
 * Nothing else in the server decides an error status.
 */
#ifndef GREYBODY_PROBLEM_H
#define GREYBODY_PROBLEM_H

#include <stdbool.h>
#include <stddef.h>

#include "status.h"

typedef enum gb_problem_kind {
    GB_PROBLEM_MALFORMED_JSON = 0,
    GB_PROBLEM_NOT_AN_OBJECT,
    GB_PROBLEM_WRONG_TYPE,
    GB_PROBLEM_MISSING_FIELD,
    GB_PROBLEM_CONFLICTING_FIELDS,
    GB_PROBLEM_UNKNOWN_FIELD,
    GB_PROBLEM_UNKNOWN_UNIT,
    GB_PROBLEM_NOT_FINITE,
    GB_PROBLEM_ARRAY_LENGTH_MISMATCH,
    GB_PROBLEM_EMPTY_ARRAY,
    GB_PROBLEM_INVALID_QUERY,
    GB_PROBLEM_INVALID_BAND,
    GB_PROBLEM_NOT_FOUND,
    GB_PROBLEM_METHOD_NOT_ALLOWED,
    GB_PROBLEM_BODY_TOO_LARGE,
    GB_PROBLEM_ARRAY_TOO_LONG,
    GB_PROBLEM_UNSUPPORTED_MEDIA_TYPE,
    GB_PROBLEM_OVERLOADED,
    GB_PROBLEM_OPENAPI_UNAVAILABLE,
    GB_PROBLEM_UNAUTHORIZED,
    GB_PROBLEM_RESPONSE_TOO_LARGE,
    GB_PROBLEM_MALFORMED_CSV,
    GB_PROBLEM_TOO_MANY_ROWS,
    GB_PROBLEM_INTERNAL,
    GB_PROBLEM_KIND_COUNT
} gb_problem_kind;

#define GB_PROBLEM_FIELD_MAX 96
#define GB_PROBLEM_DETAIL_MAX 320

typedef struct gb_problem {
    int http_status;                  /* 0 while no problem is set */
    const char *code;                 /* stable snake_case code */
    const char *title;                /* short, fixed per code */
    char field[GB_PROBLEM_FIELD_MAX]; /* offending field; "" is written as null */
    char detail[GB_PROBLEM_DETAIL_MAX];
    int retry_after;                  /* seconds for 503; 0 for none */
} gb_problem;

#define GB_PROBLEM_TYPE_BASE "https://greybody.dev/problems/"

void gb_problem_clear(gb_problem *problem);
bool gb_problem_is_set(const gb_problem *problem);

/* Sets a server problem; `field` may be NULL; `detail` is printf-style (NULL: the title). */
void gb_problem_set(gb_problem *problem, gb_problem_kind kind, const char *field,
                    const char *detail, ...) __attribute__((format(printf, 4, 5)));

/* Sets the problem for a core status; `detail` NULL means gb_status_text(status). */
void gb_problem_from_status(gb_problem *problem, gb_status status, const char *field,
                            const char *detail);

/* HTTP status for a core status (422 for domain errors, 400 for not_finite, ...). */
int gb_problem_status_http(gb_status status);

/* The problem document, malloc'd, NUL-terminated; NULL on allocation failure. */
char *gb_problem_render(const gb_problem *problem, size_t *length);

#endif
