/*
 * tls.h — optional HTTPS: the PEM certificate (chain) and private key files
 * of --tls-cert and --tls-key, read whole at start-up and handed to
 * libmicrohttpd's TLS support (GnuTLS in Debian's build).
 *
 * Ownership: gb_tls_load() fills `tls` with malloc'd copies that must live
 * until the daemon stops; gb_tls_free() wipes and frees them.
 */
#ifndef GREYBODY_TLS_H
#define GREYBODY_TLS_H

#include <stdbool.h>
#include <stddef.h>

#include "config.h"

/* PEM files larger than this are refused (a chain of a few certificates is far smaller). */
#define GB_TLS_FILE_MAX ((size_t)1024 * 1024)

typedef struct gb_tls {
    bool enabled;
    char *certificate; /* NUL-terminated PEM */
    char *key;
    size_t key_length;
} gb_tls;

/*
 * Off when neither file is configured.  false with a message naming the
 * option and file when one cannot be read, does not look like PEM, or when
 * this libmicrohttpd was built without TLS.
 */
bool gb_tls_load(gb_tls *tls, const gb_config *config, char *error, size_t error_size);

void gb_tls_free(gb_tls *tls);

#endif
