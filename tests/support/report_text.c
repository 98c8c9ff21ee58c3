#include "report_text.h"

#include <stdarg.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

void report_text_append(report_text *text, const char *bytes, size_t count)
{
    if (text->length + count + 1 > text->capacity) {
        size_t capacity = text->capacity ? text->capacity : 256;
        while (text->length + count + 1 > capacity) {
            capacity *= 2;
        }
        char *grown = realloc(text->data, capacity);
        if (grown == NULL) {
            fprintf(stderr, "report_text: out of memory\n");
            exit(EXIT_FAILURE);
        }
        text->data = grown;
        text->capacity = capacity;
    }
    if (count > 0) {
        memcpy(text->data + text->length, bytes, count);
    }
    text->length += count;
    text->data[text->length] = '\0';
}

void report_text_printf(report_text *text, const char *format, ...)
{
    va_list args;
    va_start(args, format);
    int needed = vsnprintf(NULL, 0, format, args);
    va_end(args);
    if (needed <= 0) {
        return;
    }
    char *line = malloc((size_t)needed + 1);
    if (line == NULL) {
        fprintf(stderr, "report_text: out of memory\n");
        exit(EXIT_FAILURE);
    }
    va_start(args, format);
    vsnprintf(line, (size_t)needed + 1, format, args);
    va_end(args);
    report_text_append(text, line, (size_t)needed);
    free(line);
}

void report_text_clear(report_text *text)
{
    text->length = 0;
    if (text->data != NULL) {
        text->data[0] = '\0';
    }
}

void report_text_free(report_text *text)
{
    free(text->data);
    text->data = NULL;
    text->length = 0;
    text->capacity = 0;
}
