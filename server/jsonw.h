/*
 * jsonw.h — a small streaming JSON writer for responses.
 *
 * Writes compact JSON into one growing malloc'd buffer.  Numbers are written
 * with 17 significant digits (exact round trip); a non-finite number is
 * written as null, so no response can ever contain NaN or Infinity.  Strings
 * come out as valid UTF-8 whatever bytes they hold (a byte that is not part
 * of a well-formed sequence is written as U+FFFD).  Commas
 * are inserted automatically.  On allocation failure the writer latches
 * `failed` and ignores further calls; gb_jw_take() then returns NULL.
 *
 * Ownership: the buffer belongs to the writer until gb_jw_take() hands it to
 * the caller (who frees it with free()); gb_jw_free() releases it otherwise.
 */
#ifndef GREYBODY_JSONW_H
#define GREYBODY_JSONW_H

#include <stdbool.h>
#include <stddef.h>

#define GB_JW_MAX_DEPTH 16

typedef struct gb_jw {
    char *buf;
    size_t len;
    size_t cap;
    bool failed;
    int depth;
    bool first[GB_JW_MAX_DEPTH]; /* no value written yet at this level */
    bool after_key;              /* the next value follows a key: no comma */
} gb_jw;

void gb_jw_init(gb_jw *w, size_t initial_capacity);
void gb_jw_free(gb_jw *w);
/* Hands over the NUL-terminated buffer (length in *len); NULL after a failure. */
char *gb_jw_take(gb_jw *w, size_t *len);

void gb_jw_object_begin(gb_jw *w);
void gb_jw_object_end(gb_jw *w);
void gb_jw_array_begin(gb_jw *w);
void gb_jw_array_end(gb_jw *w);
void gb_jw_key(gb_jw *w, const char *key);
void gb_jw_string(gb_jw *w, const char *text);
void gb_jw_number(gb_jw *w, double value);
void gb_jw_integer(gb_jw *w, long long value);
/* A number with a fixed count of decimals (for logs: "0.125"); non-finite -> null. */
void gb_jw_fixed(gb_jw *w, double value, int decimals);
void gb_jw_bool(gb_jw *w, bool value);
void gb_jw_null(gb_jw *w);

/* Shorthands: key then value. */
void gb_jw_kstring(gb_jw *w, const char *key, const char *text); /* NULL text writes null */
void gb_jw_knumber(gb_jw *w, const char *key, double value);
void gb_jw_kinteger(gb_jw *w, const char *key, long long value);

/* Appends `n` bytes verbatim (for non-JSON text built with the same buffer). */
void gb_jw_raw(gb_jw *w, const char *text, size_t n);

/* Appends `text` JSON-escaped (without quotes) to buf; used by the log too. */
void gb_jw_escape(gb_jw *w, const char *text);

#endif
