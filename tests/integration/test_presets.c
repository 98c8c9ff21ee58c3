/*
 * test_presets.c — the presets folder (server/presets.h): the committed
 * shared/bands.json and shared/materials.json load whole; every kind of bad
 * file is refused with a message naming the file and the entry; and
 * greybodyd given a bad folder stops at start-up with a non-zero exit status
 * and that message in its log, instead of serving.
 *
 * The bad folders are written under build/tests/integration/presets/ from the
 * committed files with one entry spoiled at a time.  Run from the project root
 * (GREYBODY_ROOT as for the other integration tests).
 */
#include <errno.h>
#include <jansson.h>
#include <stdbool.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>

#include <setjmp.h> /* cmocka needs these before its header */
#include <cmocka.h>

#include "greybodyd_run.h"
#include "presets.h"

#define PATH_TEXT 1024
#define EXIT_POLLS 400

static void project_path(char *out, size_t size, const char *relative)
{
    snprintf(out, size, "%s/%s", greybodyd_root(), relative);
}

static json_t *load_committed(const char *file)
{
    char path[PATH_TEXT];
    char relative[256];
    snprintf(relative, sizeof relative, "shared/%s", file);
    project_path(path, sizeof path, relative);
    json_t *root = json_load_file(path, 0, NULL);
    assert_non_null(root);
    return root;
}

static void make_folder(const char *path)
{
    char partial[PATH_TEXT];
    snprintf(partial, sizeof partial, "%s", path);
    for (char *slash = strchr(partial + 1, '/'); slash != NULL; slash = strchr(slash + 1, '/')) {
        *slash = '\0';
        assert_true(mkdir(partial, 0755) == 0 || errno == EEXIST);
        *slash = '/';
    }
    assert_true(mkdir(partial, 0755) == 0 || errno == EEXIST);
}

/* A folder build/tests/integration/presets/<name> holding the two documents (NULL: copied). */
static void write_folder(const char *name, json_t *bands, json_t *materials, char *folder,
                         size_t size)
{
    char relative[256];
    snprintf(relative, sizeof relative, "build/tests/integration/presets/%s", name);
    project_path(folder, size, relative);
    make_folder(folder);
    json_t *documents[2] = {bands != NULL ? json_incref(bands) : load_committed("bands.json"),
                            materials != NULL ? json_incref(materials)
                                              : load_committed("materials.json")};
    const char *files[2] = {"bands.json", "materials.json"};
    for (int i = 0; i < 2; i++) {
        char path[PATH_TEXT + 32];
        snprintf(path, sizeof path, "%s/%s", folder, files[i]);
        assert_int_equal(json_dump_file(documents[i], path, JSON_INDENT(1)), 0);
        json_decref(documents[i]);
    }
}

/* Reads the folder and expects a refusal whose message holds every one of `parts`. */
static void expect_refused(const char *folder, const char *const *parts)
{
    char error[512] = "";
    gb_presets *presets = gb_presets_read(folder, error, sizeof error);
    if (presets != NULL) {
        gb_presets_free(presets);
        fail_msg("%s was accepted", folder);
    }
    for (size_t i = 0; parts[i] != NULL; i++) {
        if (strstr(error, parts[i]) == NULL) {
            fail_msg("message \"%s\" lacks \"%s\"", error, parts[i]);
        }
    }
}

/* The committed document `file` with entry `index` of `list` changed: `key` set to the JSON
 * text `value`, or deleted when `value` is NULL. */
static json_t *spoiled(const char *file, const char *list, size_t index, const char *key,
                       const char *value)
{
    json_t *root = load_committed(file);
    json_t *entry = json_array_get(json_object_get(root, list), index);
    assert_non_null(entry);
    if (value == NULL) {
        assert_int_equal(json_object_del(entry, key), 0);
    } else {
        json_t *parsed = json_loads(value, JSON_DECODE_ANY, NULL);
        assert_non_null(parsed);
        json_object_set_new(entry, key, parsed);
    }
    return root;
}

static const char *entry_name(const char *file, const char *list, size_t index)
{
    static char name[64];
    json_t *root = load_committed(file);
    snprintf(name, sizeof name, "%s",
             json_string_value(json_object_get(
                 json_array_get(json_object_get(root, list), index), "name")));
    json_decref(root);
    return name;
}

/* ---- the committed folder ---------------------------------------------------- */

static void committed_presets_load_whole(void **state)
{
    (void)state;
    char folder[PATH_TEXT], error[512] = "";
    project_path(folder, sizeof folder, "shared");
    gb_presets *presets = gb_presets_read(folder, error, sizeof error);
    if (presets == NULL) {
        fail_msg("shared/ refused: %s", error);
    }
    json_t *bands = load_committed("bands.json");
    json_t *materials = load_committed("materials.json");
    assert_int_equal(gb_presets_band_count(presets),
                     json_array_size(json_object_get(bands, "bands")));
    assert_int_equal(gb_presets_material_count(presets),
                     json_array_size(json_object_get(materials, "materials")));
    json_decref(bands);
    json_decref(materials);
    gb_presets_install(presets);
    gb_band band;
    assert_true(gb_presets_find_band("midwave-3-5", &band));
    assert_int_equal(band.kind, GB_BAND_WAVELENGTH);
    assert_true(band.lower == 3.0 && band.upper == 5.0); /* shared/bands.json */
    assert_true(gb_presets_find_band("demo-longwave-camera", &band));
    assert_int_equal(band.kind, GB_BAND_RESPONSE);
    assert_int_equal(band.response_count, 11);
    assert_false(gb_presets_find_band("no-such-band", &band));
    size_t length = 0;
    const char *document = gb_presets_document(&length);
    assert_non_null(document);
    assert_non_null(strstr(document, "starting point, not a measurement"));
}

/* ---- bad files ---------------------------------------------------------------- */

/* One spoiled entry: the message must name the file, the entry and the reason. */
typedef struct bad_entry {
    const char *folder; /* under build/tests/integration/presets/; also the test's name */
    const char *file;   /* the document spoiled: bands.json or materials.json */
    const char *list;   /* "bands" or "materials" */
    size_t index;
    const char *key;
    const char *value; /* JSON text, or NULL to delete the key */
    const char *reason;
} bad_entry;

static const bad_entry bad_entries[] = {
    {"emissivity-above-one", "materials.json", "materials", 3, "emissivity", "1.2",
     "emissivity 1.2 is outside (0, 1]"},
    {"range-not-holding-value", "materials.json", "materials", 0, "range", "[0.5, 0.6]",
     "must lie in (0, 1] and hold the emissivity"},
    {"unknown-band-reference", "materials.json", "materials", 2, "band", "\"longwave-9-15\"",
     "band \"longwave-9-15\" is not a band of bands.json"},
    {"missing-source", "materials.json", "materials", 5, "source", NULL, "\"source\" is missing"},
    {"duplicate-band-name", "bands.json", "bands", 2, "name", "\"longwave-8-14\"",
     "already used"},
    {"reversed-band", "bands.json", "bands", 1, "wavelength", "[13.5, 7.5]", "invalid band"},
    {"misspelt-key", "bands.json", "bands", 0, "wavelenght", "[8, 14]",
     "unknown key \"wavelenght\""},
};

static void bad_entry_is_refused(void **state)
{
    const bad_entry *bad = *state;
    char folder[PATH_TEXT], place[128], named[96];
    json_t *document = spoiled(bad->file, bad->list, bad->index, bad->key, bad->value);
    bool bands = strcmp(bad->file, "bands.json") == 0;
    write_folder(bad->folder, bands ? document : NULL, bands ? NULL : document, folder,
                 sizeof folder);
    json_decref(document);
    snprintf(place, sizeof place, "%s: %s[%zu]", bad->file, bad->list, bad->index);
    snprintf(named, sizeof named, "(\"%s\")",
             strcmp(bad->key, "name") == 0 ? "longwave-8-14"
                                           : entry_name(bad->file, bad->list, bad->index));
    const char *parts[] = {place, named, bad->reason, NULL};
    expect_refused(folder, parts);
}

static void malformed_json_is_refused(void **state)
{
    (void)state;
    char folder[PATH_TEXT], path[PATH_TEXT + 32];
    write_folder("malformed", NULL, NULL, folder, sizeof folder);
    snprintf(path, sizeof path, "%s/materials.json", folder);
    FILE *file = fopen(path, "w");
    assert_non_null(file);
    fputs("{\"materials\": [\n  {\"name\": \"x\",}\n]}\n", file);
    fclose(file);
    const char *parts[] = {"materials.json", "line 2", NULL};
    expect_refused(folder, parts);
}

static void missing_folder_is_refused(void **state)
{
    (void)state;
    char folder[PATH_TEXT];
    project_path(folder, sizeof folder, "build/tests/integration/presets/not-there");
    const char *parts[] = {"no readable bands.json", "--presets-dir", NULL};
    expect_refused(folder, parts);
}

/* ---- the daemon ----------------------------------------------------------------- */

static void greybodyd_refuses_to_start_with_bad_presets(void **state)
{
    (void)state;
    char folder[PATH_TEXT];
    json_t *materials = spoiled("materials.json", "materials", 3, "emissivity", "1.2");
    write_folder("daemon", NULL, materials, folder, sizeof folder);
    json_decref(materials);
    const char *args[] = {"--presets-dir", folder, NULL};
    int exit_status = -1;
    char log_path[PATH_TEXT];
    project_path(log_path, sizeof log_path, "build/tests/presets-bad.log");
    remove(log_path); /* the log is appended to: only this start's lines may count */
    assert_true(greybodyd_start_expecting_exit("presets-bad", args, EXIT_POLLS, &exit_status));
    assert_int_not_equal(exit_status, 0);

    FILE *log = fopen(log_path, "r");
    assert_non_null(log);
    char line[2048];
    bool found = false;
    while (!found && fgets(line, sizeof line, log) != NULL) {
        found = strstr(line, "presets_invalid") != NULL &&
                strstr(line, "emissivity 1.2 is outside (0, 1]") != NULL;
    }
    fclose(log);
    assert_true(found);
}

#define BAD_ENTRY_COUNT (sizeof bad_entries / sizeof bad_entries[0])

int main(void)
{
    struct CMUnitTest tests[BAD_ENTRY_COUNT + 4];
    size_t n = 0;
    tests[n++] = (struct CMUnitTest)cmocka_unit_test(committed_presets_load_whole);
    for (size_t i = 0; i < BAD_ENTRY_COUNT; i++) {
        tests[n++] = (struct CMUnitTest){bad_entries[i].folder, bad_entry_is_refused, NULL, NULL,
                                         (void *)(uintptr_t)&bad_entries[i]};
    }
    tests[n++] = (struct CMUnitTest)cmocka_unit_test(malformed_json_is_refused);
    tests[n++] = (struct CMUnitTest)cmocka_unit_test(missing_folder_is_refused);
    tests[n++] = (struct CMUnitTest)cmocka_unit_test(greybodyd_refuses_to_start_with_bad_presets);
    return _cmocka_run_group_tests("presets", tests, n, NULL, NULL);
}
