#include "tls.h"

#include <errno.h>
#include <microhttpd.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

static char *read_pem(const char *option, const char *path, const char *expected_label,
                      size_t *length, char *error, size_t error_size)
{
    FILE *file = fopen(path, "rb");
    if (file == NULL) {
        snprintf(error, error_size, "%s %s: cannot open (%s)", option, path, strerror(errno));
        return NULL;
    }
    char *text = malloc(GB_TLS_FILE_MAX + 1);
    size_t used = text != NULL ? fread(text, 1, GB_TLS_FILE_MAX + 1, file) : 0;
    bool read_error = ferror(file) != 0;
    fclose(file);
    if (text == NULL || read_error) {
        snprintf(error, error_size, "%s %s: cannot read the file", option, path);
        free(text);
        return NULL;
    }
    if (used > GB_TLS_FILE_MAX) {
        snprintf(error, error_size, "%s %s: larger than %zu bytes; not a PEM file?", option, path,
                 GB_TLS_FILE_MAX);
        free(text);
        return NULL;
    }
    text[used] = '\0';
    if (strlen(text) != used || strstr(text, "-----BEGIN ") == NULL ||
        strstr(text, expected_label) == NULL) {
        snprintf(error, error_size, "%s %s: not a PEM file holding a %s", option, path,
                 expected_label);
        memset(text, 0, used);
        free(text);
        return NULL;
    }
    *length = used;
    return text;
}

bool gb_tls_load(gb_tls *tls, const gb_config *config, char *error, size_t error_size)
{
    memset(tls, 0, sizeof *tls);
    if (config->tls_cert[0] == '\0' && config->tls_key[0] == '\0') {
        return true;
    }
    if (config->tls_cert[0] == '\0' || config->tls_key[0] == '\0') {
        snprintf(error, error_size, "--tls-cert and --tls-key go together: give both or neither");
        return false;
    }
    if (MHD_is_feature_supported(MHD_FEATURE_TLS) != MHD_YES) {
        snprintf(error, error_size,
                 "--tls-cert: this libmicrohttpd was built without TLS support");
        return false;
    }
    size_t certificate_length = 0;
    tls->certificate = read_pem("--tls-cert", config->tls_cert, "CERTIFICATE",
                                &certificate_length, error, error_size);
    if (tls->certificate == NULL) {
        return false;
    }
    tls->key = read_pem("--tls-key", config->tls_key, "PRIVATE KEY", &tls->key_length, error,
                        error_size);
    if (tls->key == NULL) {
        gb_tls_free(tls);
        return false;
    }
    tls->enabled = true;
    return true;
}

void gb_tls_free(gb_tls *tls)
{
    if (tls->key != NULL) {
        volatile char *key = tls->key;
        for (size_t i = 0; i < tls->key_length; i++) {
            key[i] = '\0';
        }
    }
    free(tls->key);
    free(tls->certificate);
    memset(tls, 0, sizeof *tls);
}
