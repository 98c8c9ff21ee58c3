/*
 * presets.h — named sensor bands and a table of typical emissivities, read at
 * start-up from the presets folder (shared/ of the project: bands.json and
 * materials.json).
 *
 * Folder: --presets-dir (GREYBODY_PRESETS_DIR) when set; otherwise shared/ in
 * the working directory, then beside the binary's directory (datapath.h).
 * Both files are validated as a whole before anything is served:
 *   bands.json      {"about": "...", "bands": [{"name", "title",
 *                    exactly one of "wavelength": [lo, hi] (um),
 *                    "wavenumber": [lo, hi] (cm^-1) or
 *                    "response": {"wavelength": [...], "value": [...]},
 *                    optional "synthetic": true|false, optional "note"}]}
 *   materials.json  {"about": "...", "materials": [{"name", "title",
 *                    "emissivity" in (0, 1], "range": [lo, hi] holding it,
 *                    "band": a band name of bands.json, "source" (a named
 *                    handbook, or "from memory"), optional "note"}]}
 * Names are unique, made of a-z, 0-9, '.', '_' and '-' (they travel in query
 * strings); every band passes gb_band_validate; unknown keys are errors, so
 * a misspelt key cannot be silently ignored.  A failure names the file and
 * the entry, e.g. "shared/materials.json: materials[3] (\"ice\"): emissivity
 * 1.2 is outside (0, 1]".
 *
 * Ownership and threads: gb_presets_read() returns a set the caller frees
 * with gb_presets_free(), or hands to gb_presets_install(), which keeps it
 * (and the response arrays its bands point into) until the process ends.
 * Install once, before serving; afterwards the set is only read, from any
 * thread.
 */
#ifndef GREYBODY_PRESETS_H
#define GREYBODY_PRESETS_H

#include <stdbool.h>
#include <stddef.h>

#include "band.h"

#define GB_PRESETS_RELATIVE_DIR "shared"
#define GB_PRESETS_BANDS_FILE "bands.json"
#define GB_PRESETS_MATERIALS_FILE "materials.json"

/* The warning served with the table (and repeated in the API documentation). */
#define GB_PRESETS_WARNING                                                                       \
    "A table emissivity is a starting point, not a measurement: it depends on surface finish, " \
    "oxidation, temperature, viewing angle and band. Measure it on the object (/v1/emissivity) " \
    "when the result matters."

typedef struct gb_presets gb_presets;

/*
 * Reads and validates both files.  NULL on failure, with a message naming
 * the file and the entry in `error`.
 */
gb_presets *gb_presets_read(const char *configured_dir, char *error, size_t error_size);

void gb_presets_free(gb_presets *presets);

/* The folder the set was read from. */
const char *gb_presets_folder(const gb_presets *presets);
size_t gb_presets_band_count(const gb_presets *presets);
size_t gb_presets_material_count(const gb_presets *presets);

/* Makes `presets` the served set (takes ownership; a previous set is kept alive). */
void gb_presets_install(gb_presets *presets);

/* The installed band named `name`; false when there is none of that name. */
bool gb_presets_find_band(const char *name, gb_band *band);

/* GET /v1/presets: the installed set as a JSON document; NULL when none is installed. */
const char *gb_presets_document(size_t *length);

#endif
