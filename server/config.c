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
                "        api-docs/openapi.json in the working directory or beside the binary's\n"
                "        parent directory)"),
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
