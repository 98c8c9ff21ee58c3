/*
 * datapath.h — where greybodyd finds the files it ships with (the OpenAPI
 * document, the presets folder) when no path is configured.
 *
 * A configured path is used alone.  Otherwise the project-relative path is
 * looked for in the working directory first, then beside the directory that
 * holds the binary (build/greybodyd -> build/..), so `build/greybodyd` finds
 * its files from any working directory of a checkout, and last in the
 * installed layout (PREFIX/bin/greybodyd -> PREFIX/share/greybody/, see
 * mk/install.mk).
 */
#ifndef GREYBODY_DATAPATH_H
#define GREYBODY_DATAPATH_H

#include <limits.h>
#include <stddef.h>

#define GB_DATA_PATH_CANDIDATES 3

/*
 * Writes the candidate paths of `relative` (e.g. "api-docs/openapi.json") in
 * the order to try them, and returns how many (1 to 3).
 */
size_t gb_data_path_candidates(const char *configured, const char *relative,
                               char out[GB_DATA_PATH_CANDIDATES][PATH_MAX]);

#endif
