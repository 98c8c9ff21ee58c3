#include "auth.h"

#include <errno.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <strings.h>

static bool is_token_character(char ch)
{
    return (ch >= 'A' && ch <= 'Z') || (ch >= 'a' && ch <= 'z') || (ch >= '0' && ch <= '9') ||
           ch == '-' || ch == '.' || ch == '_' || ch == '~' || ch == '+' || ch == '/';
}

/* RFC 6750 b64token: token characters, then only '=' padding. */
static bool is_b64token(const char *text, size_t length)
{
    size_t i = 0;
    while (i < length && is_token_character(text[i])) {
        i++;
    }
    if (i == 0) {
        return false;
    }
    while (i < length && text[i] == '=') {
        i++;
    }
    return i == length;
}

static bool set_token(gb_auth *auth, const char *text, size_t length, const char *source,
                      char *error, size_t error_size)
{
    while (length > 0 && (text[length - 1] == '\n' || text[length - 1] == '\r' ||
                          text[length - 1] == ' ' || text[length - 1] == '\t')) {
        length--;
    }
    if (length < GB_AUTH_TOKEN_MIN || length > GB_AUTH_TOKEN_MAX) {
        snprintf(error, error_size,
                 "%s: the token must have %d to %d characters (it has %zu); for example "
                 "`head -c 32 /dev/urandom | base64`",
                 source, GB_AUTH_TOKEN_MIN, GB_AUTH_TOKEN_MAX, length);
        return false;
    }
    if (!is_b64token(text, length)) {
        snprintf(error, error_size,
                 "%s: the token may hold only A-Z a-z 0-9 - . _ ~ + / and trailing =", source);
        return false;
    }
    memcpy(auth->token, text, length);
    auth->token[length] = '\0';
    auth->token_length = length;
    auth->enabled = true;
    return true;
}

static bool read_token_file(gb_auth *auth, const char *path, char *error, size_t error_size)
{
    FILE *file = fopen(path, "r");
    if (file == NULL) {
        snprintf(error, error_size, "--auth-token-file %s: cannot open (%s)", path,
                 strerror(errno));
        return false;
    }
    char line[GB_AUTH_TOKEN_MAX + 4];
    bool got = fgets(line, sizeof line, file) != NULL;
    fclose(file);
    char source[GB_CONFIG_TEXT_MAX + 32];
    snprintf(source, sizeof source, "--auth-token-file %s", path);
    if (!got) {
        snprintf(error, error_size, "%s: the file is empty", source);
        return false;
    }
    bool ok = set_token(auth, line, strlen(line), source, error, error_size);
    memset(line, 0, sizeof line);
    return ok;
}

bool gb_auth_load(gb_auth *auth, const gb_config *config, char *error, size_t error_size)
{
    memset(auth, 0, sizeof *auth);
    snprintf(auth->open_paths, sizeof auth->open_paths, "%s", config->auth_open_paths);
    if (config->auth_token_file[0] != '\0') {
        return read_token_file(auth, config->auth_token_file, error, error_size);
    }
    const char *from_environment = getenv(GB_AUTH_TOKEN_ENV);
    if (from_environment != NULL && from_environment[0] != '\0') {
        return set_token(auth, from_environment, strlen(from_environment), GB_AUTH_TOKEN_ENV,
                         error, error_size);
    }
    return true;
}

void gb_auth_clear(gb_auth *auth)
{
    volatile char *token = auth->token;
    for (size_t i = 0; i < sizeof auth->token; i++) {
        token[i] = '\0';
    }
    auth->token_length = 0;
    auth->enabled = false;
}

bool gb_auth_tokens_equal(const char *given, size_t given_length, const char *expected,
                          size_t expected_length)
{
    volatile unsigned char difference = given_length != expected_length;
    for (size_t i = 0; i < expected_length; i++) {
        unsigned char byte = i < given_length ? (unsigned char)given[i] : 0;
        difference |= (unsigned char)(byte ^ (unsigned char)expected[i]);
    }
    return difference == 0;
}

static bool is_open_path(const char *list, const char *path)
{
    size_t path_length = strlen(path);
    const char *entry = list;
    while (*entry != '\0') {
        const char *end = strchr(entry, ',');
        size_t n = end != NULL ? (size_t)(end - entry) : strlen(entry);
        const char *start = entry;
        while (n > 0 && *start == ' ') {
            start++;
            n--;
        }
        while (n > 0 && start[n - 1] == ' ') {
            n--;
        }
        if (n > 0 && n == path_length && memcmp(start, path, n) == 0) {
            return true;
        }
        if (end == NULL) {
            break;
        }
        entry = end + 1;
    }
    return false;
}

gb_auth_verdict gb_auth_check(const gb_auth *auth, const char *path, bool is_preflight,
                              const char *authorization)
{
    if (!auth->enabled || is_preflight || is_open_path(auth->open_paths, path)) {
        return GB_AUTH_GRANTED;
    }
    static const char scheme[] = "Bearer";
    if (authorization == NULL || strncasecmp(authorization, scheme, sizeof scheme - 1) != 0 ||
        authorization[sizeof scheme - 1] != ' ') {
        return GB_AUTH_MISSING;
    }
    const char *credentials = authorization + sizeof scheme - 1;
    while (*credentials == ' ') {
        credentials++;
    }
    size_t length = strlen(credentials);
    while (length > 0 && (credentials[length - 1] == ' ' || credentials[length - 1] == '\t')) {
        length--;
    }
    if (length == 0) {
        return GB_AUTH_MISSING;
    }
    return gb_auth_tokens_equal(credentials, length, auth->token, auth->token_length)
               ? GB_AUTH_GRANTED
               : GB_AUTH_INVALID;
}

const char *gb_auth_challenge(gb_auth_verdict verdict)
{
    return verdict == GB_AUTH_INVALID ? "Bearer realm=\"" GB_AUTH_REALM "\", error=\"invalid_token\""
                                      : "Bearer realm=\"" GB_AUTH_REALM "\"";
}
