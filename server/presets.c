#include "presets.h"

#include <jansson.h>
#include <limits.h>
#include <stdarg.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>

#include "datapath.h"
#include "jsonw.h"

#define NAME_MAX_LENGTH 63

typedef struct band_preset {
    char *name;
    gb_band band;
    double *response_wavelength; /* owned; RESPONSE bands only */
    double *response_value;
} band_preset;

struct gb_presets {
    char folder[PATH_MAX];
    band_preset *bands;
    size_t band_count;
    size_t material_count;
    char *document; /* the GET /v1/presets body */
    size_t document_length;
};

static gb_presets *installed;

/* ------------------------------------------------------------ messages ---- */

/* Where an entry sits, for messages: "shared/bands.json: bands[2] (\"midwave-3-5\")". */
typedef struct entry_place {
    const char *path;
    const char *list;
    size_t index;
    const char *name; /* NULL until known */
    char *error;
    size_t error_size;
} entry_place;

static bool entry_fail(const entry_place *place, const char *format, ...)
    __attribute__((format(printf, 2, 3)));

static bool entry_fail(const entry_place *place, const char *format, ...)
{
    char what[256];
    va_list args;
    va_start(args, format);
    vsnprintf(what, sizeof what, format, args);
    va_end(args);
    if (place->name != NULL) {
        snprintf(place->error, place->error_size, "%s: %s[%zu] (\"%.63s\"): %s", place->path,
                 place->list, place->index, place->name, what);
    } else {
        snprintf(place->error, place->error_size, "%s: %s[%zu]: %s", place->path, place->list,
                 place->index, what);
    }
    return false;
}

/* ------------------------------------------------------------- readers ---- */

static bool only_keys(const entry_place *place, json_t *object, const char *const *keys)
{
    const char *key;
    json_t *value;
    json_object_foreach(object, key, value)
    {
        bool known = false;
        for (size_t i = 0; keys[i] != NULL && !known; i++) {
            known = strcmp(key, keys[i]) == 0;
        }
        if (!known) {
            return entry_fail(place, "unknown key \"%.60s\"", key);
        }
    }
    return true;
}

static bool text_member(const entry_place *place, json_t *object, const char *key, bool required,
                        const char **text)
{
    json_t *value = json_object_get(object, key);
    *text = NULL;
    if (value == NULL) {
        return required ? entry_fail(place, "\"%s\" is missing", key) : true;
    }
    if (!json_is_string(value) || json_string_length(value) == 0) {
        return entry_fail(place, "\"%s\" must be a non-empty string", key);
    }
    *text = json_string_value(value);
    return true;
}

static bool valid_name(const char *name)
{
    size_t n = strlen(name);
    if (n == 0 || n > NAME_MAX_LENGTH) {
        return false;
    }
    for (size_t i = 0; i < n; i++) {
        char c = name[i];
        if (!((c >= 'a' && c <= 'z') || (c >= '0' && c <= '9') || c == '.' || c == '_' ||
              c == '-')) {
            return false;
        }
    }
    return true;
}

static bool name_member(entry_place *place, json_t *object, const char **name)
{
    if (!text_member(place, object, "name", true, name)) {
        return false;
    }
    if (!valid_name(*name)) {
        return entry_fail(place, "\"name\" must be 1 to %d characters of a-z, 0-9, '.', '_' "
                                 "and '-'",
                          NAME_MAX_LENGTH);
    }
    place->name = *name;
    return true;
}

static bool pair_member(const entry_place *place, json_t *value, const char *key, double pair[2])
{
    if (!json_is_array(value) || json_array_size(value) != 2 ||
        !json_is_number(json_array_get(value, 0)) || !json_is_number(json_array_get(value, 1))) {
        return entry_fail(place, "\"%s\" must be an array of two numbers", key);
    }
    pair[0] = json_number_value(json_array_get(value, 0));
    pair[1] = json_number_value(json_array_get(value, 1));
    return true;
}

static bool number_array(const entry_place *place, json_t *array, const char *key, double **out)
{
    size_t n = json_array_size(array);
    *out = malloc((n > 0 ? n : 1) * sizeof **out);
    if (*out == NULL) {
        return entry_fail(place, "out of memory");
    }
    for (size_t i = 0; i < n; i++) {
        json_t *element = json_array_get(array, i);
        if (!json_is_number(element)) {
            return entry_fail(place, "\"%s\"[%zu] is not a number", key, i);
        }
        (*out)[i] = json_number_value(element);
    }
    return true;
}

static bool response_member(const entry_place *place, json_t *value, band_preset *preset)
{
    static const char *const keys[] = {"wavelength", "value", NULL};
    if (!json_is_object(value)) {
        return entry_fail(place, "\"response\" must be an object {\"wavelength\": [...], "
                                 "\"value\": [...]}");
    }
    if (!only_keys(place, value, keys)) {
        return false;
    }
    json_t *wavelength = json_object_get(value, "wavelength");
    json_t *response = json_object_get(value, "value");
    if (!json_is_array(wavelength) || !json_is_array(response) ||
        json_array_size(wavelength) != json_array_size(response)) {
        return entry_fail(place, "\"response\" needs arrays \"wavelength\" and \"value\" of the "
                                 "same length");
    }
    if (!number_array(place, wavelength, "response.wavelength", &preset->response_wavelength) ||
        !number_array(place, response, "response.value", &preset->response_value)) {
        return false;
    }
    preset->band.kind = GB_BAND_RESPONSE;
    preset->band.response_wavelength_um = preset->response_wavelength;
    preset->band.response_value = preset->response_value;
    preset->band.response_count = json_array_size(wavelength);
    return true;
}

/* The band of an entry: exactly one of wavelength, wavenumber, response. */
static bool band_member(const entry_place *place, json_t *entry, band_preset *preset)
{
    static const char *const kinds[] = {"wavelength", "wavenumber", "response"};
    const char *chosen = NULL;
    for (size_t i = 0; i < 3; i++) {
        if (json_object_get(entry, kinds[i]) == NULL) {
            continue;
        }
        if (chosen != NULL) {
            return entry_fail(place, "give only one of \"%s\" and \"%s\"", chosen, kinds[i]);
        }
        chosen = kinds[i];
    }
    if (chosen == NULL) {
        return entry_fail(place, "one of \"wavelength\", \"wavenumber\" or \"response\" is "
                                 "needed");
    }
    json_t *value = json_object_get(entry, chosen);
    bool ok;
    memset(&preset->band, 0, sizeof preset->band);
    if (strcmp(chosen, "response") == 0) {
        ok = response_member(place, value, preset);
    } else {
        double limits[2];
        ok = pair_member(place, value, chosen, limits);
        preset->band.kind =
            strcmp(chosen, "wavelength") == 0 ? GB_BAND_WAVELENGTH : GB_BAND_WAVENUMBER;
        preset->band.lower = limits[0];
        preset->band.upper = limits[1];
    }
    if (!ok) {
        return false;
    }
    gb_status status = gb_band_validate(&preset->band);
    if (status != GB_OK) {
        return entry_fail(place, "invalid band: %s", gb_status_text(status));
    }
    return true;
}

/* ------------------------------------------------------- writing out ---- */

static void write_pair(gb_jw *w, const char *key, double lower, double upper)
{
    gb_jw_key(w, key);
    gb_jw_array_begin(w);
    gb_jw_number(w, lower);
    gb_jw_number(w, upper);
    gb_jw_array_end(w);
}

static void write_band(gb_jw *w, const gb_band *band)
{
    gb_jw_object_begin(w);
    if (band->kind == GB_BAND_RESPONSE) {
        gb_jw_key(w, "response");
        gb_jw_object_begin(w);
        gb_jw_key(w, "wavelength");
        gb_jw_array_begin(w);
        for (size_t i = 0; i < band->response_count; i++) {
            gb_jw_number(w, band->response_wavelength_um[i]);
        }
        gb_jw_array_end(w);
        gb_jw_key(w, "value");
        gb_jw_array_begin(w);
        for (size_t i = 0; i < band->response_count; i++) {
            gb_jw_number(w, band->response_value[i]);
        }
        gb_jw_array_end(w);
        gb_jw_object_end(w);
    } else {
        write_pair(w, band->kind == GB_BAND_WAVELENGTH ? "wavelength" : "wavenumber",
                   band->lower, band->upper);
    }
    gb_jw_object_end(w);
}

static void write_optional_text(gb_jw *w, const char *key, json_t *entry)
{
    json_t *value = json_object_get(entry, key);
    if (json_is_string(value)) {
        gb_jw_kstring(w, key, json_string_value(value));
    }
}

/* ---------------------------------------------------------------- files ---- */

/* The file's entry list; its "about" text is written to `w` as "<list>_about". */
static json_t *load_list(const char *path, const char *list, gb_jw *w, char *error,
                         size_t error_size, json_t **root_out)
{
    json_error_t parse_error;
    json_t *root = json_load_file(path, JSON_REJECT_DUPLICATES | JSON_DECODE_INT_AS_REAL,
                                  &parse_error);
    *root_out = root;
    if (root == NULL) {
        snprintf(error, error_size, "%s: %s (line %d, column %d)", path, parse_error.text,
                 parse_error.line, parse_error.column);
        return NULL;
    }
    const char *key;
    json_t *value;
    if (!json_is_object(root)) {
        snprintf(error, error_size, "%s: the file must hold a JSON object", path);
        return NULL;
    }
    json_object_foreach(root, key, value)
    {
        if (strcmp(key, "about") != 0 && strcmp(key, list) != 0) {
            snprintf(error, error_size, "%s: unknown key \"%.60s\" (expected \"about\" and "
                                        "\"%s\")",
                     path, key, list);
            return NULL;
        }
    }
    json_t *about = json_object_get(root, "about");
    if (about != NULL && !json_is_string(about)) {
        snprintf(error, error_size, "%s: \"about\" must be a string", path);
        return NULL;
    }
    json_t *entries = json_object_get(root, list);
    if (!json_is_array(entries) || json_array_size(entries) == 0) {
        snprintf(error, error_size, "%s: \"%s\" must be a non-empty array", path, list);
        return NULL;
    }
    if (about != NULL) {
        char about_key[32];
        snprintf(about_key, sizeof about_key, "%s_about", list);
        gb_jw_kstring(w, about_key, json_string_value(about));
    }
    return entries;
}

static const band_preset *band_named(const gb_presets *set, const char *name)
{
    for (size_t i = 0; set != NULL && i < set->band_count; i++) {
        if (set->bands[i].name != NULL && strcmp(set->bands[i].name, name) == 0) {
            return &set->bands[i];
        }
    }
    return NULL;
}

static bool read_bands(gb_presets *set, const char *path, gb_jw *w, char *error,
                       size_t error_size)
{
    static const char *const keys[] = {"name", "title", "wavelength", "wavenumber", "response",
                                       "synthetic", "note", NULL};
    json_t *root = NULL;
    json_t *entries = load_list(path, "bands", w, error, error_size, &root);
    bool ok = entries != NULL;
    size_t count = ok ? json_array_size(entries) : 0;
    if (ok) {
        set->bands = calloc(count, sizeof *set->bands);
        ok = set->bands != NULL;
        if (!ok) {
            snprintf(error, error_size, "%s: out of memory", path);
        }
    }
    gb_jw_key(w, "bands");
    gb_jw_array_begin(w);
    for (size_t i = 0; ok && i < count; i++) {
        json_t *entry = json_array_get(entries, i);
        entry_place place = {path, "bands", i, NULL, error, error_size};
        band_preset *preset = &set->bands[i];
        const char *name = NULL, *title = NULL, *note = NULL;
        json_t *synthetic = json_object_get(entry, "synthetic");
        ok = json_is_object(entry) ? name_member(&place, entry, &name)
                                   : entry_fail(&place, "each band must be a JSON object");
        ok = ok && only_keys(&place, entry, keys) &&
             text_member(&place, entry, "title", true, &title) &&
             text_member(&place, entry, "note", false, &note);
        if (ok && synthetic != NULL && !json_is_boolean(synthetic)) {
            ok = entry_fail(&place, "\"synthetic\" must be true or false");
        }
        if (ok && band_named(set, name) != NULL) {
            ok = entry_fail(&place, "the name is already used by an earlier band");
        }
        ok = ok && band_member(&place, entry, preset);
        if (ok) {
            preset->name = strdup(name);
            set->band_count = i + 1;
            ok = preset->name != NULL || entry_fail(&place, "out of memory");
        }
        if (ok) {
            gb_jw_object_begin(w);
            gb_jw_kstring(w, "name", name);
            gb_jw_kstring(w, "title", title);
            gb_jw_key(w, "band");
            write_band(w, &preset->band);
            gb_jw_key(w, "synthetic");
            gb_jw_bool(w, json_is_true(synthetic));
            write_optional_text(w, "note", entry);
            gb_jw_object_end(w);
        } else {
            set->band_count = i + 1; /* so that free() releases this entry's arrays too */
        }
    }
    gb_jw_array_end(w);
    json_decref(root);
    return ok;
}

static bool read_material(const gb_presets *set, entry_place *place, json_t *entry,
                          json_t *names_seen, gb_jw *w)
{
    static const char *const keys[] = {"name", "title", "emissivity", "range", "band",
                                       "source", "note", NULL};
    const char *name = NULL, *title = NULL, *band = NULL, *source = NULL, *note = NULL;
    double range[2];
    if (!json_is_object(entry)) {
        return entry_fail(place, "each material must be a JSON object");
    }
    if (!name_member(place, entry, &name) || !only_keys(place, entry, keys) ||
        !text_member(place, entry, "title", true, &title) ||
        !text_member(place, entry, "band", true, &band) ||
        !text_member(place, entry, "source", true, &source) ||
        !text_member(place, entry, "note", false, &note)) {
        return false;
    }
    json_t *seen = json_object_get(names_seen, name);
    if (seen != NULL) {
        return entry_fail(place, "the name is already used by materials[%lld]",
                          (long long)json_integer_value(seen));
    }
    json_object_set_new(names_seen, name, json_integer((json_int_t)place->index));
    json_t *emissivity_value = json_object_get(entry, "emissivity");
    if (!json_is_number(emissivity_value)) {
        return entry_fail(place, "\"emissivity\" must be a number");
    }
    double emissivity = json_number_value(emissivity_value);
    if (!(emissivity > 0.0 && emissivity <= 1.0)) {
        return entry_fail(place, "emissivity %g is outside (0, 1]", emissivity);
    }
    json_t *range_value = json_object_get(entry, "range");
    if (range_value == NULL) {
        return entry_fail(place, "\"range\" is missing");
    }
    if (!pair_member(place, range_value, "range", range)) {
        return false;
    }
    if (!(range[0] > 0.0 && range[0] <= emissivity && emissivity <= range[1] && range[1] <= 1.0)) {
        return entry_fail(place, "range [%g, %g] must lie in (0, 1] and hold the emissivity %g",
                          range[0], range[1], emissivity);
    }
    if (band_named(set, band) == NULL) {
        return entry_fail(place, "band \"%.63s\" is not a band of %s", band,
                          GB_PRESETS_BANDS_FILE);
    }
    gb_jw_object_begin(w);
    gb_jw_kstring(w, "name", name);
    gb_jw_kstring(w, "title", title);
    gb_jw_knumber(w, "emissivity", emissivity);
    write_pair(w, "range", range[0], range[1]);
    gb_jw_kstring(w, "band", band);
    gb_jw_kstring(w, "source", source);
    write_optional_text(w, "note", entry);
    gb_jw_object_end(w);
    return true;
}

static bool read_materials(gb_presets *set, const char *path, gb_jw *w, char *error,
                           size_t error_size)
{
    json_t *root = NULL;
    json_t *entries = load_list(path, "materials", w, error, error_size, &root);
    json_t *names_seen = json_object();
    bool ok = entries != NULL && names_seen != NULL;
    gb_jw_key(w, "materials");
    gb_jw_array_begin(w);
    for (size_t i = 0; ok && i < json_array_size(entries); i++) {
        entry_place place = {path, "materials", i, NULL, error, error_size};
        ok = read_material(set, &place, json_array_get(entries, i), names_seen, w);
        set->material_count += ok;
    }
    gb_jw_array_end(w);
    json_decref(names_seen);
    json_decref(root);
    return ok;
}

/* The folder to read: the configured one, or the first default place holding bands.json. */
static bool choose_folder(const char *configured, char *folder, char *error, size_t error_size)
{
    char candidates[GB_DATA_PATH_CANDIDATES][PATH_MAX];
    size_t count = gb_data_path_candidates(configured, GB_PRESETS_RELATIVE_DIR, candidates);
    for (size_t i = 0; i < count; i++) {
        char path[PATH_MAX + 32];
        snprintf(path, sizeof path, "%.4000s/%s", candidates[i], GB_PRESETS_BANDS_FILE);
        if (access(path, R_OK) == 0) {
            snprintf(folder, PATH_MAX, "%s", candidates[i]);
            return true;
        }
    }
    char places[1200] = "";
    for (size_t i = 0, used = 0; i < count && used < sizeof places; i++) {
        int n = snprintf(places + used, sizeof places - used, "%s%.380s", i ? ", " : "",
                         candidates[i]);
        used += n > 0 ? (size_t)n : 0;
    }
    snprintf(error, error_size,
             "no readable %s in %s; set --presets-dir (GREYBODY_PRESETS_DIR) to the folder "
             "holding %s and %s",
             GB_PRESETS_BANDS_FILE, places, GB_PRESETS_BANDS_FILE, GB_PRESETS_MATERIALS_FILE);
    return false;
}

gb_presets *gb_presets_read(const char *configured_dir, char *error, size_t error_size)
{
    gb_presets *set = calloc(1, sizeof *set);
    if (set == NULL) {
        snprintf(error, error_size, "out of memory");
        return NULL;
    }
    if (!choose_folder(configured_dir, set->folder, error, error_size)) {
        free(set);
        return NULL;
    }
    char bands_path[PATH_MAX + 32], materials_path[PATH_MAX + 32];
    snprintf(bands_path, sizeof bands_path, "%.4000s/%s", set->folder, GB_PRESETS_BANDS_FILE);
    snprintf(materials_path, sizeof materials_path, "%.4000s/%s", set->folder,
             GB_PRESETS_MATERIALS_FILE);
    gb_jw w;
    gb_jw_init(&w, 16384);
    gb_jw_object_begin(&w);
    gb_jw_kstring(&w, "warning", GB_PRESETS_WARNING);
    bool ok = read_bands(set, bands_path, &w, error, error_size) &&
              read_materials(set, materials_path, &w, error, error_size);
    if (ok) {
        gb_jw_object_end(&w);
        set->document = gb_jw_take(&w, &set->document_length);
        if (set->document == NULL) {
            snprintf(error, error_size, "out of memory");
            ok = false;
        }
    } else {
        gb_jw_free(&w);
    }
    if (!ok) {
        gb_presets_free(set);
        return NULL;
    }
    return set;
}

void gb_presets_free(gb_presets *presets)
{
    if (presets == NULL) {
        return;
    }
    for (size_t i = 0; i < presets->band_count; i++) {
        free(presets->bands[i].name);
        free(presets->bands[i].response_wavelength);
        free(presets->bands[i].response_value);
    }
    free(presets->bands);
    free(presets->document);
    free(presets);
}

const char *gb_presets_folder(const gb_presets *presets)
{
    return presets->folder;
}

size_t gb_presets_band_count(const gb_presets *presets)
{
    return presets->band_count;
}

size_t gb_presets_material_count(const gb_presets *presets)
{
    return presets->material_count;
}

void gb_presets_install(gb_presets *presets)
{
    installed = presets;
}

bool gb_presets_find_band(const char *name, gb_band *band)
{
    const band_preset *preset = band_named(installed, name);
    if (preset == NULL) {
        return false;
    }
    *band = preset->band;
    return true;
}

const char *gb_presets_document(size_t *length)
{
    if (installed == NULL) {
        *length = 0;
        return NULL;
    }
    *length = installed->document_length;
    return installed->document;
}
