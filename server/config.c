#include "config.h"

#include <errno.h>
#include <limits.h>
#include <stdint.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>

#include "version.h"

typedef enum option_type { OPT_TEXT, OPT_UNSIGNED, OPT_SIZE } option_type;

typedef struct option {
    const char *flag;
    const char *env;
    option_type type;
    size_t offset;
    size_t text_size;
    const char *help;
} option;

#define TEXT_OPTION(flag, env, member, help) \
    {flag, env, OPT_TEXT, offsetof(gb_config, member), sizeof(((gb_config *)0)->member), help}
#define NUM_OPTION(flag, env, kind, member, help) {flag, env, kind, offsetof(gb_config, member), 0, help}

static const option options[] = {
    TEXT_OPTION("--listen", "GREYBODY_LISTEN", listen,
                "address to serve on: host:port, [ipv6]:port or :port (all interfaces);\n"
                "        port 0 picks a free port (default 127.0.0.1:8080)"),
    NUM_OPTION("--threads", "GREYBODY_THREADS", OPT_UNSIGNED, threads,
               "worker threads: 0 = one thread per connection (default), N = a pool of N"),
    NUM_OPTION("--max-body-bytes", "GREYBODY_MAX_BODY_BYTES", OPT_SIZE, max_body_bytes,
               "largest request body; suffixes K, M, G (binary) (default 16M)"),
    NUM_OPTION("--max-array", "GREYBODY_MAX_ARRAY", OPT_SIZE, max_array,
               "longest array accepted in a request (default 1048576)"),
    NUM_OPTION("--max-connections", "GREYBODY_MAX_CONNECTIONS", OPT_UNSIGNED, max_connections,
               "simultaneous connections (default 1000)"),
    NUM_OPTION("--timeout", "GREYBODY_TIMEOUT", OPT_UNSIGNED, timeout_seconds,
               "seconds an idle connection is kept; 0 = never (default 30)"),
    NUM_OPTION("--max-batches", "GREYBODY_MAX_BATCHES", OPT_UNSIGNED, max_batches,
               "large requests (bodies over 64 KiB) computed at once; more wait up to\n"
               "        2 s, then get 503 (default: number of CPUs)"),
    NUM_OPTION("--drain-timeout", "GREYBODY_DRAIN_TIMEOUT", OPT_UNSIGNED, drain_seconds,
               "seconds to let requests in flight finish on SIGTERM/SIGINT (default 10)"),
    TEXT_OPTION("--cors-origins", "GREYBODY_CORS_ORIGINS", cors_origins,
                "origins allowed to call from a browser: comma list, or * (default none)"),
    TEXT_OPTION("--openapi", "GREYBODY_OPENAPI", openapi_path,
                "the OpenAPI document served at /openapi.json (default\n"
                "        api-docs/openapi.json in the working directory, beside the binary's\n"
                "        parent directory, or installed in PREFIX/share/greybody)"),
    NUM_OPTION("--max-depth", "GREYBODY_MAX_DEPTH", OPT_UNSIGNED, max_depth,
               "deepest JSON nesting accepted in a request body (default 32, at most 256)"),
    NUM_OPTION("--max-response-bytes", "GREYBODY_MAX_RESPONSE_BYTES", OPT_SIZE,
               max_response_bytes,
               "largest response body; a request asking for more gets 413 (default 256M)"),
    NUM_OPTION("--max-connections-per-ip", "GREYBODY_MAX_CONNECTIONS_PER_IP", OPT_UNSIGNED,
               max_connections_per_ip,
               "simultaneous connections from one client address; 0 = no limit (default 500)"),
    NUM_OPTION("--connection-memory", "GREYBODY_CONNECTION_MEMORY", OPT_SIZE,
               connection_memory_bytes,
               "memory per connection for the request line and headers; larger headers\n"
               "        get 431 (default 32K)"),
    NUM_OPTION("--read-timeout", "GREYBODY_READ_TIMEOUT", OPT_UNSIGNED, read_timeout_seconds,
               "seconds a client has to send a whole request (headers and body), counted\n"
               "        from the connection or the previous answer; 0 = never (default 60)"),
    TEXT_OPTION("--auth-token-file", "GREYBODY_AUTH_TOKEN_FILE", auth_token_file,
                "require \"Authorization: Bearer TOKEN\" with the token read from this file;\n"
                "        the variable GREYBODY_AUTH_TOKEN may hold the token itself instead\n"
                "        (default: no authentication)"),
    TEXT_OPTION("--auth-open-paths", "GREYBODY_AUTH_OPEN_PATHS", auth_open_paths,
                "comma list of paths served without a token when authentication is on;\n"
                "        \"\" protects every path (default /healthz,/readyz)"),
    TEXT_OPTION("--tls-cert", "GREYBODY_TLS_CERT", tls_cert,
                "serve HTTPS with this PEM certificate (chain) file; needs --tls-key"),
    TEXT_OPTION("--tls-key", "GREYBODY_TLS_KEY", tls_key,
                "the PEM private key of --tls-cert (unencrypted)"),
    TEXT_OPTION("--presets-dir", "GREYBODY_PRESETS_DIR", presets_dir,
                "folder holding bands.json and materials.json (default shared/ in the working\n"
                "        directory, beside the binary's parent directory, or installed in\n"
                "        PREFIX/share/greybody)"),
    NUM_OPTION("--max-draws", "GREYBODY_MAX_DRAWS", OPT_SIZE, max_draws,
               "most Monte Carlo draws one /v1/sensitivity request may ask for\n"
               "        (default 200000, at most 1000000)"),
    NUM_OPTION("--max-spectrum-points", "GREYBODY_MAX_SPECTRUM_POINTS", OPT_SIZE,
               max_spectrum_points,
               "most grid points of one /v1/spectrum request (default 10000, at most 100000)"),
    NUM_OPTION("--max-spectrum-curves", "GREYBODY_MAX_SPECTRUM_CURVES", OPT_SIZE,
               max_spectrum_curves,
               "most temperatures (curves) of one /v1/spectrum request (default 16, at most 256)"),
    NUM_OPTION("--max-csv-rows", "GREYBODY_MAX_CSV_ROWS", OPT_SIZE, max_csv_rows,
               "most data rows of one text/csv batch; more get 413 (default 10000)"),
};

#define OPTION_COUNT (sizeof options / sizeof options[0])

void gb_config_defaults(gb_config *config)
{
    memset(config, 0, sizeof *config);
    snprintf(config->listen, sizeof config->listen, "%s", "127.0.0.1:8080");
    config->threads = 0;
    config->max_body_bytes = (size_t)16 * 1024 * 1024;
    config->max_array = 1048576;
    config->max_connections = 1000;
    config->timeout_seconds = 30;
    long cpus = sysconf(_SC_NPROCESSORS_ONLN);
    config->max_batches = cpus > 0 ? (unsigned)cpus : 2;
    config->drain_seconds = 10;
    config->max_depth = 32;
    config->max_response_bytes = (size_t)256 * 1024 * 1024;
    config->max_connections_per_ip = 500;
    config->connection_memory_bytes = (size_t)32 * 1024;
    config->read_timeout_seconds = 60;
    snprintf(config->auth_open_paths, sizeof config->auth_open_paths, "%s", "/healthz,/readyz");
    config->max_draws = 200000;
    config->max_spectrum_points = 10000;
    config->max_spectrum_curves = 16;
    config->max_csv_rows = 10000;
}

void gb_config_usage(FILE *out)
{
    fprintf(out,
            "usage: greybodyd [options]\n"
            "greybody " GREYBODY_VERSION " - radiometric conversions over HTTP.\n"
            "Every option can also be set by the environment variable named beside it;\n"
            "a flag wins over the variable.  Flags take --name VALUE or --name=VALUE.\n\n");
    for (size_t i = 0; i < OPTION_COUNT; i++) {
        fprintf(out, "  %s VALUE  (%s)\n        %s\n", options[i].flag, options[i].env,
                options[i].help);
    }
    fprintf(out, "  --help     this text\n  --version  print the version\n\n"
                 "SIGTERM or SIGINT: stop accepting, finish requests in flight, exit 0.\n");
}

static bool parse_unsigned(const char *text, unsigned long long max, unsigned long long *value,
                           bool allow_suffix)
{
    if (text == NULL || *text < '0' || *text > '9') {
        return false;
    }
    errno = 0;
    char *end = NULL;
    unsigned long long v = strtoull(text, &end, 10);
    if (errno != 0 || end == text) {
        return false;
    }
    if (allow_suffix && *end != '\0') {
        unsigned long long scale = 0;
        switch (*end) {
        case 'k': case 'K': scale = 1024ULL; break;
        case 'm': case 'M': scale = 1024ULL * 1024; break;
        case 'g': case 'G': scale = 1024ULL * 1024 * 1024; break;
        default: return false;
        }
        end++;
        if (*end == 'i' || *end == 'I') {
            end++;
        }
        if (*end == 'b' || *end == 'B') {
            end++;
        }
        if (v > max / scale) {
            return false;
        }
        v *= scale;
    }
    if (*end != '\0' || v > max) {
        return false;
    }
    *value = v;
    return true;
}

static bool apply(gb_config *config, const option *opt, const char *value, const char *source,
                  FILE *err)
{
    char *base = (char *)config;
    unsigned long long number = 0;
    switch (opt->type) {
    case OPT_TEXT:
        if (strlen(value) >= opt->text_size) {
            fprintf(err, "greybodyd: %s: value too long\n", source);
            return false;
        }
        memcpy(base + opt->offset, value, strlen(value) + 1);
        return true;
    case OPT_UNSIGNED:
        if (!parse_unsigned(value, UINT_MAX, &number, false)) {
            fprintf(err, "greybodyd: %s: expected a whole number, got \"%s\"\n", source, value);
            return false;
        }
        *(unsigned *)(void *)(base + opt->offset) = (unsigned)number;
        return true;
    case OPT_SIZE:
        if (!parse_unsigned(value, SIZE_MAX / 2, &number, true)) {
            fprintf(err, "greybodyd: %s: expected a size (e.g. 16777216 or 16M), got \"%s\"\n",
                    source, value);
            return false;
        }
        *(size_t *)(void *)(base + opt->offset) = (size_t)number;
        return true;
    }
    return false;
}

static bool check(const gb_config *config, FILE *err)
{
    if (config->listen[0] == '\0') {
        fprintf(err, "greybodyd: --listen: empty address\n");
        return false;
    }
    if (config->max_body_bytes == 0) {
        fprintf(err, "greybodyd: --max-body-bytes must be at least 1\n");
        return false;
    }
    if (config->max_array == 0) {
        fprintf(err, "greybodyd: --max-array must be at least 1\n");
        return false;
    }
    if (config->max_connections == 0) {
        fprintf(err, "greybodyd: --max-connections must be at least 1\n");
        return false;
    }
    if (config->max_batches == 0) {
        fprintf(err, "greybodyd: --max-batches must be at least 1\n");
        return false;
    }
    if (config->threads > 1024) {
        fprintf(err, "greybodyd: --threads must be at most 1024\n");
        return false;
    }
    if (config->max_depth < 2 || config->max_depth > GB_CONFIG_MAX_DEPTH_CEILING) {
        fprintf(err, "greybodyd: --max-depth must be 2 to %d\n", GB_CONFIG_MAX_DEPTH_CEILING);
        return false;
    }
    if (config->max_response_bytes < 4096) {
        fprintf(err, "greybodyd: --max-response-bytes must be at least 4096 (problem documents "
                     "must fit)\n");
        return false;
    }
    if (config->connection_memory_bytes < 4096) {
        fprintf(err, "greybodyd: --connection-memory must be at least 4096\n");
        return false;
    }
    if ((config->tls_cert[0] == '\0') != (config->tls_key[0] == '\0')) {
        fprintf(err, "greybodyd: --tls-cert and --tls-key go together: give both or neither\n");
        return false;
    }
    if (config->max_draws < GB_CONFIG_MIN_DRAWS || config->max_draws > GB_CONFIG_MAX_DRAWS) {
        fprintf(err, "greybodyd: --max-draws must be %d to %d\n", GB_CONFIG_MIN_DRAWS,
                GB_CONFIG_MAX_DRAWS);
        return false;
    }
    if (config->max_spectrum_points < 2 ||
        config->max_spectrum_points > GB_CONFIG_MAX_SPECTRUM_POINTS) {
        fprintf(err, "greybodyd: --max-spectrum-points must be 2 to %d\n",
                GB_CONFIG_MAX_SPECTRUM_POINTS);
        return false;
    }
    if (config->max_spectrum_curves < 1 ||
        config->max_spectrum_curves > GB_CONFIG_MAX_SPECTRUM_CURVES) {
        fprintf(err, "greybodyd: --max-spectrum-curves must be 1 to %d\n",
                GB_CONFIG_MAX_SPECTRUM_CURVES);
        return false;
    }
    if (config->max_csv_rows < 1) {
        fprintf(err, "greybodyd: --max-csv-rows must be at least 1\n");
        return false;
    }
    return true;
}

gb_config_result gb_config_load(gb_config *config, int argc, char **argv, FILE *out, FILE *err)
{
    gb_config_defaults(config);
    for (size_t i = 0; i < OPTION_COUNT; i++) {
        const char *value = getenv(options[i].env);
        if (value != NULL && !apply(config, &options[i], value, options[i].env, err)) {
            return GB_CONFIG_ERROR;
        }
    }
    for (int a = 1; a < argc; a++) {
        const char *arg = argv[a];
        if (strcmp(arg, "--help") == 0 || strcmp(arg, "-h") == 0) {
            gb_config_usage(out);
            return GB_CONFIG_EXIT_SUCCESS;
        }
        if (strcmp(arg, "--version") == 0) {
            fprintf(out, "%s %s\n", GREYBODY_NAME, GREYBODY_VERSION);
            return GB_CONFIG_EXIT_SUCCESS;
        }
        const option *opt = NULL;
        const char *value = NULL;
        for (size_t i = 0; i < OPTION_COUNT && opt == NULL; i++) {
            size_t n = strlen(options[i].flag);
            if (strncmp(arg, options[i].flag, n) == 0) {
                if (arg[n] == '=') {
                    opt = &options[i];
                    value = arg + n + 1;
                } else if (arg[n] == '\0') {
                    opt = &options[i];
                    if (a + 1 >= argc) {
                        fprintf(err, "greybodyd: %s needs a value\n", arg);
                        return GB_CONFIG_ERROR;
                    }
                    value = argv[++a];
                }
            }
        }
        if (opt == NULL) {
            fprintf(err, "greybodyd: unknown option \"%s\" (try --help)\n", arg);
            return GB_CONFIG_ERROR;
        }
        if (!apply(config, opt, value, opt->flag, err)) {
            return GB_CONFIG_ERROR;
        }
    }
    return check(config, err) ? GB_CONFIG_OK : GB_CONFIG_ERROR;
}
