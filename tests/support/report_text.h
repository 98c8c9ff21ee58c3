/*
 * report_text.h — a growing, always NUL-terminated text buffer for test
 * reports and HTTP bodies.
 *
 * Ownership: the buffer owns `data`; report_text_free() releases it.  A
 * zero-initialised report_text is empty and valid.  Running out of memory
 * ends the test program (a test cannot report anything useful then).
 */
#ifndef GREYBODY_TEST_REPORT_TEXT_H
#define GREYBODY_TEST_REPORT_TEXT_H

#include <stddef.h>

typedef struct report_text {
    char *data; /* NULL until something is appended */
    size_t length;
    size_t capacity;
} report_text;

void report_text_append(report_text *text, const char *bytes, size_t count);
void report_text_printf(report_text *text, const char *format, ...)
    __attribute__((format(printf, 2, 3)));
/* Empties the text but keeps its memory. */
void report_text_clear(report_text *text);
void report_text_free(report_text *text);

#endif
