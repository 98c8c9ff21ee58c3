#include "prometheus_check.h"

#include <math.h>
#include <stdbool.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

typedef struct metric_family {
    char name[128];
    char type[16];
    bool has_help;
    bool closed; /* its group of samples has ended */
} metric_family;

#define MAX_FAMILIES 256
#define MAX_SERIES 512

typedef struct histogram_series {
    char key[640]; /* family name + labels without le */
    double last_le;
    double last_count;
    double infinity_count;
    bool has_infinity;
    bool has_count;
    double count;
    bool has_sum;
} histogram_series;

typedef struct exposition {
    metric_family families[MAX_FAMILIES];
    size_t family_count;
    histogram_series series[MAX_SERIES];
    size_t series_count;
    metric_family *current;
} exposition;

static metric_family *family_named(exposition *doc, const char *name, bool create)
{
    for (size_t i = 0; i < doc->family_count; i++) {
        if (strcmp(doc->families[i].name, name) == 0) {
            return &doc->families[i];
        }
    }
    if (!create || doc->family_count == MAX_FAMILIES) {
        return NULL;
    }
    metric_family *family = &doc->families[doc->family_count++];
    memset(family, 0, sizeof *family);
    snprintf(family->name, sizeof family->name, "%s", name);
    return family;
}

static histogram_series *series_for(exposition *doc, const char *key)
{
    for (size_t i = 0; i < doc->series_count; i++) {
        if (strcmp(doc->series[i].key, key) == 0) {
            return &doc->series[i];
        }
    }
    if (doc->series_count == MAX_SERIES) {
        return NULL;
    }
    histogram_series *series = &doc->series[doc->series_count++];
    memset(series, 0, sizeof *series);
    series->last_le = -INFINITY;
    snprintf(series->key, sizeof series->key, "%s", key);
    return series;
}

/* The family a sample name belongs to: histograms own their _bucket, _sum and _count. */
static metric_family *family_of_sample(exposition *doc, const char *sample, const char **suffix)
{
    static const char *const histogram_suffixes[] = {"_bucket", "_sum", "_count"};
    for (size_t i = 0; i < sizeof histogram_suffixes / sizeof histogram_suffixes[0]; i++) {
        size_t sample_length = strlen(sample);
        size_t suffix_length = strlen(histogram_suffixes[i]);
        if (sample_length > suffix_length
            && strcmp(sample + sample_length - suffix_length, histogram_suffixes[i]) == 0) {
            char base[128];
            snprintf(base, sizeof base, "%.*s", (int)(sample_length - suffix_length), sample);
            metric_family *family = family_named(doc, base, false);
            if (family != NULL && strcmp(family->type, "histogram") == 0) {
                *suffix = histogram_suffixes[i];
                return family;
            }
        }
    }
    *suffix = "";
    return family_named(doc, sample, false);
}

/* Splits `{a="1",le="0.5"}` into the labels without le, and the le value. */
static void split_labels(const char *labels, size_t length, char *rest, size_t rest_size, char *le,
                         size_t le_size)
{
    size_t r = 0;
    le[0] = '\0';
    const char *cursor = labels;
    const char *end = labels + length;
    while (cursor < end) {
        const char *pair_end = cursor;
        bool quoted = false;
        while (pair_end < end && (quoted || *pair_end != ',')) {
            if (*pair_end == '"' && (pair_end == cursor || pair_end[-1] != '\\')) {
                quoted = !quoted;
            }
            pair_end++;
        }
        size_t pair_length = (size_t)(pair_end - cursor);
        if (pair_length > 4 && strncmp(cursor, "le=\"", 4) == 0) {
            snprintf(le, le_size, "%.*s", (int)(pair_length - 5), cursor + 4);
        } else if (pair_length > 0 && r + pair_length + 2 < rest_size) {
            if (r > 0) {
                rest[r++] = ',';
            }
            memcpy(rest + r, cursor, pair_length);
            r += pair_length;
        }
        cursor = pair_end + 1;
    }
    rest[r] = '\0';
}

static void check_histogram_sample(exposition *doc, const metric_family *family, const char *suffix,
                                   const char *labels, size_t labels_length, double value,
                                   report_text *report)
{
    char rest[400];
    char le[64];
    split_labels(labels, labels_length, rest, sizeof rest, le, sizeof le);
    char key[640];
    snprintf(key, sizeof key, "%s{%s}", family->name, rest);
    histogram_series *series = series_for(doc, key);
    if (series == NULL) {
        return;
    }
    if (strcmp(suffix, "_bucket") == 0) {
        double bound = strcmp(le, "+Inf") == 0 ? INFINITY : strtod(le, NULL);
        if (le[0] == '\0') {
            report_text_printf(report, "  metrics: %s bucket without le\n", key);
        } else if (!(bound > series->last_le)) {
            report_text_printf(
                report, "  metrics: %s buckets not in increasing le order at le=%s\n", key, le);
        }
        if (value < series->last_count) {
            report_text_printf(report,
                               "  metrics: %s bucket le=%s (%g) below the previous one (%g)\n", key,
                               le, value, series->last_count);
        }
        series->last_le = bound;
        series->last_count = value;
        if (isinf(bound)) {
            series->has_infinity = true;
            series->infinity_count = value;
        }
    } else if (strcmp(suffix, "_count") == 0) {
        series->has_count = true;
        series->count = value;
    } else if (strcmp(suffix, "_sum") == 0) {
        series->has_sum = true;
    } else {
        report_text_printf(report, "  metrics: histogram %s has a bare sample\n", family->name);
    }
}

static void check_sample_line(exposition *doc, const char *line, report_text *report)
{
    size_t name_length = strcspn(line, "{ ");
    char sample[128];
    snprintf(sample, sizeof sample, "%.*s", (int)name_length, line);
    const char *labels = "";
    size_t labels_length = 0;
    const char *after = line + name_length;
    if (*after == '{') {
        const char *close = strchr(after, '}');
        if (close == NULL) {
            report_text_printf(report, "  metrics: unterminated labels in \"%s\"\n", line);
            return;
        }
        labels = after + 1;
        labels_length = (size_t)(close - labels);
        after = close + 1;
    }
    char *value_end = NULL;
    double value = strtod(after, &value_end);
    if (value_end == after) {
        report_text_printf(report, "  metrics: no value in \"%s\"\n", line);
        return;
    }
    const char *suffix;
    metric_family *family = family_of_sample(doc, sample, &suffix);
    if (family == NULL || !family->has_help || family->type[0] == '\0') {
        report_text_printf(report, "  metrics: sample %s comes before its # HELP and # TYPE\n",
                           sample);
        return;
    }
    if (family->closed) {
        report_text_printf(report, "  metrics: samples of %s are not in one group\n", family->name);
    }
    if (doc->current != NULL && doc->current != family) {
        doc->current->closed = true;
    }
    doc->current = family;
    if (strcmp(family->type, "histogram") == 0) {
        check_histogram_sample(doc, family, suffix, labels, labels_length, value, report);
    } else if (strcmp(family->type, "counter") != 0 && name_length > 6
               && strcmp(sample + name_length - 6, "_total") == 0) {
        report_text_printf(report, "  metrics: %s ends in _total but is a %s\n", sample,
                           family->type);
    }
}

static void check_comment_line(exposition *doc, const char *line, report_text *report)
{
    char keyword[8];
    char name[128];
    char type[16] = "";
    int fields = sscanf(line, "# %7s %127s %15s", keyword, name, type);
    if (fields < 2 || (strcmp(keyword, "HELP") != 0 && strcmp(keyword, "TYPE") != 0)) {
        return;
    }
    metric_family *family = family_named(doc, name, true);
    if (family == NULL) {
        return;
    }
    if (family->closed) {
        report_text_printf(report, "  metrics: # %s %s after its samples\n", keyword, name);
    }
    if (strcmp(keyword, "HELP") == 0) {
        family->has_help = true;
    } else {
        snprintf(family->type, sizeof family->type, "%s", type);
    }
}

void prometheus_check_exposition(const char *body, report_text *report)
{
    exposition *doc = calloc(1, sizeof *doc);
    char *copy = strdup(body);
    if (doc == NULL || copy == NULL) {
        report_text_printf(report, "  metrics: out of memory\n");
        free(doc);
        free(copy);
        return;
    }
    char *save = NULL;
    for (char *line = strtok_r(copy, "\n", &save); line != NULL;
         line = strtok_r(NULL, "\n", &save)) {
        if (line[0] == '#') {
            check_comment_line(doc, line, report);
        } else if (line[0] != '\0') {
            check_sample_line(doc, line, report);
        }
    }
    for (size_t i = 0; i < doc->series_count; i++) {
        const histogram_series *series = &doc->series[i];
        if (!series->has_infinity) {
            report_text_printf(report, "  metrics: %s has no le=\"+Inf\" bucket\n", series->key);
        } else if (!series->has_count || series->count != series->infinity_count) {
            report_text_printf(report, "  metrics: %s +Inf bucket %g differs from _count %g\n",
                               series->key, series->infinity_count, series->count);
        }
        if (!series->has_sum) {
            report_text_printf(report, "  metrics: %s has no _sum\n", series->key);
        }
    }
    if (doc->series_count == 0) {
        report_text_printf(report, "  metrics: no histogram found\n");
    }
    free(doc);
    free(copy);
}
