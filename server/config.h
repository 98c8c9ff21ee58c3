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
/* --max-depth cannot exceed this (the nesting scan keeps one small record per level). */
#define GB_CONFIG_MAX_DEPTH_CEILING 256
/* Bounds of --max-draws (core/montecarlo.h) and the spectrum limits (core/spectrum.h). */
#define GB_CONFIG_MIN_DRAWS 100
#define GB_CONFIG_MAX_DRAWS 1000000
#define GB_CONFIG_MAX_SPECTRUM_POINTS 100000
#define GB_CONFIG_MAX_SPECTRUM_CURVES 256

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
    /* Resource bounds (see DEVELOPERS.md, "Limits"). */
    unsigned max_depth;               /* deepest JSON nesting in a body, default 32 */
    size_t max_response_bytes;        /* largest response body, default 256 MiB */
    unsigned max_connections_per_ip;  /* default 500; 0 = no per-address limit */
    size_t connection_memory_bytes;   /* per connection, holds the headers; default 32 KiB */
    unsigned read_timeout_seconds;    /* whole request received within; default 60; 0 never */
    /* Security (auth.h, tls.h). */
    char auth_token_file[GB_CONFIG_TEXT_MAX]; /* "" = GREYBODY_AUTH_TOKEN, or no auth */
    char auth_open_paths[GB_CONFIG_TEXT_MAX]; /* paths served without a token */
    char tls_cert[GB_CONFIG_TEXT_MAX];        /* PEM files; both or neither */
    char tls_key[GB_CONFIG_TEXT_MAX];
    /* Workflows (presets.h, /v1/sensitivity monte-carlo, /v1/spectrum). */
    char presets_dir[GB_CONFIG_TEXT_MAX]; /* "" = shared/, searched like openapi_path */
    size_t max_draws;                     /* Monte Carlo draws per request, default 200000 */
    size_t max_spectrum_points;           /* grid points per spectrum, default 10000 */
    size_t max_spectrum_curves;           /* temperatures per spectrum, default 16 */
    size_t max_csv_rows;                  /* data rows of one text/csv batch, default 10000 */
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
