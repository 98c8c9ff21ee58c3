/*
 * config.h — greybodyd's settings: every option is a command-line flag and an
 * environment variable (the flag wins over the variable, the variable over the
 * default).  `greybodyd --help` lists them.
 */
#ifndef GREYBODY_CONFIG_H
#define GREYBODY_CONFIG_H

#include <stdbool.h>
#include <stddef.h>
#include <stdio.h>

#define GB_CONFIG_TEXT_MAX 1024
#define GB_CORS_MAX_ORIGINS 32

typedef struct gb_config {
    char listen[256];            /* host:port, [v6]:port or :port; default 127.0.0.1:8080 */
    unsigned threads;            /* 0: a thread per connection; N: a pool of N workers */
    size_t max_body_bytes;       /* default 16 MiB */
    size_t max_array;            /* longest array accepted, default 1048576 */
    unsigned max_connections;    /* default 1000 */
    unsigned timeout_seconds;    /* idle connection timeout, default 30; 0 never */
    unsigned max_batches;        /* large requests computed at once; default = CPUs */
    unsigned drain_seconds;      /* longest wait for requests in flight at shutdown */
    char cors_origins[GB_CONFIG_TEXT_MAX]; /* comma list or "*"; "" = no CORS */
    char openapi_path[GB_CONFIG_TEXT_MAX]; /* "" = api-docs/openapi.json, searched */
} gb_config;

/* Defaults only (no flags, no environment). */
void gb_config_defaults(gb_config *config);

typedef enum gb_config_result {
    GB_CONFIG_OK = 0,
    GB_CONFIG_EXIT_SUCCESS, /* --help or --version was printed */
    GB_CONFIG_ERROR         /* a message was written to `err` */
} gb_config_result;

/* Defaults, then the environment, then the flags.  Help and version go to `out`. */
gb_config_result gb_config_load(gb_config *config, int argc, char **argv, FILE *out, FILE *err);

void gb_config_usage(FILE *out);

#endif
