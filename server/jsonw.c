#include "jsonw.h"

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

static bool reserve(gb_jw *w, size_t extra)
{
    if (w->failed) {
        return false;
    }
    if (w->len + extra + 1 <= w->cap) {
        return true;
    }
    size_t cap = w->cap ? w->cap : 256;
    while (cap < w->len + extra + 1) {
        if (cap > ((size_t)-1) / 2) {
            w->failed = true;
            return false;
        }
        cap *= 2;
    }
    char *grown = realloc(w->buf, cap);
    if (grown == NULL) {
        w->failed = true;
        return false;
    }
    w->buf = grown;
    w->cap = cap;
    return true;
}

static void raw(gb_jw *w, const char *text, size_t n)
{
    if (!reserve(w, n)) {
        return;
    }
    memcpy(w->buf + w->len, text, n);
    w->len += n;
    w->buf[w->len] = '\0';
}

void gb_jw_raw(gb_jw *w, const char *text, size_t n)
{
    raw(w, text, n);
}

static void separator(gb_jw *w)
{
    if (w->after_key) {
        w->after_key = false;
        return;
    }
    if (w->depth > 0) {
        if (!w->first[w->depth - 1]) {
            raw(w, ",", 1);
        }
        w->first[w->depth - 1] = false;
    }
}

void gb_jw_init(gb_jw *w, size_t initial_capacity)
{
    memset(w, 0, sizeof *w);
    if (initial_capacity > 0) {
        reserve(w, initial_capacity);
    }
}

void gb_jw_free(gb_jw *w)
{
    free(w->buf);
    w->buf = NULL;
    w->len = w->cap = 0;
}

char *gb_jw_take(gb_jw *w, size_t *len)
{
    if (w->failed || !reserve(w, 0)) {
        gb_jw_free(w);
        *len = 0;
        return NULL;
    }
    char *out = w->buf;
    *len = w->len;
    w->buf = NULL;
    w->len = w->cap = 0;
    return out;
}

static void open_container(gb_jw *w, const char *bracket)
{
    separator(w);
    raw(w, bracket, 1);
    if (w->depth >= GB_JW_MAX_DEPTH) {
        w->failed = true;
        return;
    }
    w->first[w->depth++] = true;
}

static void close_container(gb_jw *w, const char *bracket)
{
    if (w->depth > 0) {
        w->depth--;
    }
    raw(w, bracket, 1);
}

void gb_jw_object_begin(gb_jw *w) { open_container(w, "{"); }
void gb_jw_object_end(gb_jw *w) { close_container(w, "}"); }
void gb_jw_array_begin(gb_jw *w) { open_container(w, "["); }
void gb_jw_array_end(gb_jw *w) { close_container(w, "]"); }

/*
 * Bytes in the well-formed UTF-8 sequence starting at `s` (RFC 3629: no
 * overlong forms, no surrogates, nothing above U+10FFFF), 0 if there is none.
 * Text echoed from requests (field names, values in details) may hold any
 * bytes, and a fixed-size copy may have cut a character in half.
 */
static size_t utf8_sequence_length(const unsigned char *s)
{
    unsigned char lead = s[0];
    size_t length;
    unsigned char low = 0x80;
    unsigned char high = 0xBF;
    if (lead >= 0xC2 && lead <= 0xDF) {
        length = 2;
    } else if (lead >= 0xE0 && lead <= 0xEF) {
        length = 3;
        low = lead == 0xE0 ? 0xA0 : 0x80;
        high = lead == 0xED ? 0x9F : 0xBF;
    } else if (lead >= 0xF0 && lead <= 0xF4) {
        length = 4;
        low = lead == 0xF0 ? 0x90 : 0x80;
        high = lead == 0xF4 ? 0x8F : 0xBF;
    } else {
        return 0;
    }
    if (s[1] < low || s[1] > high) {
        return 0;
    }
    for (size_t k = 2; k < length; k++) {
        if (s[k] < 0x80 || s[k] > 0xBF) {
            return 0;
        }
    }
    return length;
}

void gb_jw_escape(gb_jw *w, const char *text)
{
    static const char hex[] = "0123456789abcdef";
    const unsigned char *s = (const unsigned char *)text;
    size_t run = 0;
    for (size_t i = 0;; i++) {
        unsigned char ch = s[i];
        if (ch >= 0x80) {
            size_t length = utf8_sequence_length(s + i);
            if (length > 0) {
                run += length;
                i += length - 1;
                continue;
            }
            raw(w, (const char *)s + i - run, run);
            run = 0;
            raw(w, "\\ufffd", 6); /* a byte that is not UTF-8: the replacement character */
            continue;
        }
        if (ch != '\0' && ch >= 0x20 && ch != '"' && ch != '\\') {
            run++;
            continue;
        }
        raw(w, (const char *)s + i - run, run);
        run = 0;
        if (ch == '\0') {
            break;
        }
        char esc[7] = {'\\', 0, 0, 0, 0, 0, 0};
        size_t n = 2;
        switch (ch) {
        case '"': esc[1] = '"'; break;
        case '\\': esc[1] = '\\'; break;
        case '\n': esc[1] = 'n'; break;
        case '\r': esc[1] = 'r'; break;
        case '\t': esc[1] = 't'; break;
        default:
            esc[1] = 'u';
            esc[2] = '0';
            esc[3] = '0';
            esc[4] = hex[ch >> 4];
            esc[5] = hex[ch & 15];
            n = 6;
        }
        raw(w, esc, n);
    }
}

void gb_jw_key(gb_jw *w, const char *key)
{
    separator(w);
    raw(w, "\"", 1);
    gb_jw_escape(w, key);
    raw(w, "\":", 2);
    w->after_key = true;
}

void gb_jw_string(gb_jw *w, const char *text)
{
    if (text == NULL) {
        gb_jw_null(w);
        return;
    }
    separator(w);
    raw(w, "\"", 1);
    gb_jw_escape(w, text);
    raw(w, "\"", 1);
}

void gb_jw_number(gb_jw *w, double value)
{
    if (!isfinite(value)) {
        gb_jw_null(w);
        return;
    }
    separator(w);
    if (!reserve(w, 32)) {
        return;
    }
    char *at = w->buf + w->len;
    int n = snprintf(at, 32, "%.17g", value);
    if (n <= 0 || n >= 32) {
        w->failed = true;
        return;
    }
    /* Like jansson: keep a real looking like a real ("300.0", not "300"). */
    if (strpbrk(at, ".eE") == NULL) {
        at[n++] = '.';
        at[n++] = '0';
        at[n] = '\0';
    }
    w->len += (size_t)n;
}

void gb_jw_fixed(gb_jw *w, double value, int decimals)
{
    char text[64];
    if (!isfinite(value) || fabs(value) >= 1e30) {
        gb_jw_null(w);
        return;
    }
    int n = snprintf(text, sizeof text, "%.*f", decimals, value);
    if (n <= 0 || n >= (int)sizeof text) {
        gb_jw_null(w);
        return;
    }
    separator(w);
    raw(w, text, (size_t)n);
}

void gb_jw_integer(gb_jw *w, long long value)
{
    char text[32];
    int n = snprintf(text, sizeof text, "%lld", value);
    separator(w);
    raw(w, text, (size_t)n);
}

void gb_jw_bool(gb_jw *w, bool value)
{
    separator(w);
    raw(w, value ? "true" : "false", value ? 4 : 5);
}

void gb_jw_null(gb_jw *w)
{
    separator(w);
    raw(w, "null", 4);
}

void gb_jw_kstring(gb_jw *w, const char *key, const char *text)
{
    gb_jw_key(w, key);
    gb_jw_string(w, text);
}

void gb_jw_knumber(gb_jw *w, const char *key, double value)
{
    gb_jw_key(w, key);
    gb_jw_number(w, value);
}

void gb_jw_kinteger(gb_jw *w, const char *key, long long value)
{
    gb_jw_key(w, key);
    gb_jw_integer(w, value);
}
