/*
 * test_frames.c — whole frames over HTTP (server/frames.h) against the real
 * build/greybodyd on a free loopback port: float32 bodies in, float32
 * temperatures out, the emissivity map, the status plane and its header,
 * and every size and value error naming its field.
 *
 * Expected temperatures come from outside the server: the worked examples of
 * /work/shared/REFERENCES.md (9 digits), or tests/integration/oracle.py
 * (mpmath, 30 digits) evaluated at the float32 value each input pixel really
 * holds -- for Sakuma-Hattori calibrations, the model's closed-form inverse in
 * mpmath.  An answer is float32, so it may differ from the exact temperature
 * by one float32 step of the answer (relative 1.2e-7) plus, for REFERENCES
 * values, what rounding the input to float32 moves it (stated per case).
 */
#include <curl/curl.h>
#include <math.h>
#include <stdbool.h>
#include <stddef.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include <setjmp.h> /* cmocka needs these before its header */
#include <stdarg.h>
#include <cmocka.h>

#include "greybodyd_run.h"
#include "http_client.h"

/* The integration suite's array limit: 1001 pixels are one too many. */
#define SERVER_MAX_ARRAY "1000"
#define MAX_PIXELS 1100
/* One float32 step, relative: 2^-23. */
#define FLOAT_STEP 1.1920928955078125e-7

static greybodyd_run server;
static CURL *client;

/* ---- bodies and answers ------------------------------------------------------ */

static size_t encode(const float *values, size_t count, unsigned char *out)
{
    for (size_t i = 0; i < count; i++) {
        uint32_t bits;
        memcpy(&bits, &values[i], sizeof bits);
        for (int b = 0; b < 4; b++) {
            out[4 * i + (size_t)b] = (unsigned char)(bits >> (8 * b));
        }
    }
    return 4 * count;
}

static float decode(const unsigned char *bytes)
{
    uint32_t bits = (uint32_t)bytes[0] | (uint32_t)bytes[1] << 8 | (uint32_t)bytes[2] << 16 |
                    (uint32_t)bytes[3] << 24;
    float value;
    memcpy(&value, &bits, sizeof value);
    return value;
}

static const char *body_of(const http_response *response)
{
    return response->body.data != NULL ? response->body.data : "";
}

/* POSTs `length` bytes as application/octet-stream to `path`. */
static void post_frame(const char *path, const unsigned char *body, size_t length,
                       http_response *response)
{
    char url[1024], error[256];
    struct curl_slist *headers =
        curl_slist_append(NULL, "Content-Type: application/octet-stream");
    snprintf(url, sizeof url, "%s%s", server.base_url, path);
    bool exchanged = http_client_exchange(client, url, "POST", headers,
                                          (const char *)body, length, NULL, response, error,
                                          sizeof error);
    curl_slist_free_all(headers);
    if (!exchanged) {
        fail_msg("POST %s: %s", path, error);
    }
}

static void post_floats(const char *path, const float *values, size_t count,
                        http_response *response)
{
    static unsigned char body[4 * 2 * MAX_PIXELS];
    assert_true(count <= 2 * MAX_PIXELS);
    post_frame(path, body, encode(values, count, body), response);
}

/* ---- answers that must be right ---------------------------------------------- */

typedef struct frame_case {
    const char *name;
    const char *path;
    float pixels[8];     /* the first plane, then the map when there is one */
    size_t count;        /* floats in the body */
    size_t answers;      /* pixels in the answer */
    double expected[5];  /* temperatures in the request's unit */
    double input_slack;  /* extra absolute tolerance for REFERENCES values (float32 inputs) */
    const char *unresolved;
    bool status_plane;
    unsigned char codes[4];
    const char *source;
} frame_case;

/*
 * Invented calibrations as /v1/calibration/fit gives them (percent-encoded JSON):
 * tests/reference/vectors/calibration_fits.tsv sets sh_handheld_exact (A 9.6 um,
 * B 120 um K, C 1e5) and band_lwir_exact (8-14 um, gain 850, offset 1200).
 */
#define CALIBRATION_HANDHELD                                                                   \
    "calibration=%7B%22model%22%3A%22sakuma-hattori%22%2C%22parameters%22%3A%7B%22A_um%22%3A9.6" \
    "%2C%22B_um_K%22%3A120%2C%22C%22%3A1e5%7D%7D"
#define CALIBRATION_LWIR                                                                       \
    "calibration=%7B%22model%22%3A%22band%22%2C%22band%22%3A%7B%22wavelength%22%3A%5B8%2C14%5D" \
    "%7D%2C%22parameters%22%3A%7B%22gain%22%3A850%2C%22offset%22%3A1200%7D%7D"

static const frame_case answer_cases[] = {
    {"worked example A and exact fallbacks, one emissivity",
     "/v1/corrected-temperature?emissivity=0.95&reflected_temperature=293.15&band=8,14"
     "&width=5&height=1",
     {308.15f, 250.0f, 400.0f, 1500.0f, 1990.0f}, 5, 5,
     /* oracle.py at the float32 inputs; 1990 K lands beyond the 150-2000 K table (exact path) */
     {308.886822988, 246.940300287, 404.177227483, 1549.59156742, 2063.28396906},
     0.0, "0", false, {0}, "tests/integration/oracle.py (mpmath)"},
    {"emissivity map with the status plane: answered, out of domain, no net signal",
     "/v1/corrected-temperature?emissivity=map&reflected_temperature=293.15&status_plane=true",
     {308.15f, 308.15f, 300.0f, 200.0f, 0.95f, 0.5f, 0.0f, 0.5f}, 8, 4,
     /* REFERENCES.md worked example A at eps 0.95 and 0.5; the last two have no answer */
     {308.886829, 321.438243, 0.0, 0.0},
     /* 308.15 as float32 is 6.1e-6 K lower; dT/dT_app is below 2.5 at these emissivities */
     6.1e-6 * 2.5, "2", true, {0, 0, 1, 2}, "/work/shared/REFERENCES.md worked example A"},
    {"worked example B in Celsius with transmittance and atmosphere",
     "/v1/corrected-temperature?emissivity=0.95&reflected_temperature=20&transmittance=0.9"
     "&atmosphere_temperature=15&temperature_unit=C",
     {35.0f}, 1, 1,
     {310.995305 - 273.15}, 5e-7 /* the reference's last digit */, "0", false, {0},
     "/work/shared/REFERENCES.md worked example B"},
    {"band-temperature radiances, default emissivity 1",
     "/v1/band-temperature?band=8,14",
     {62.0157802011f, 10.0f, 500.0f}, 3, 3,
     {308.150001335, 217.034625996, 555.241388767}, 0.0, "0", false, {0},
     "tests/integration/oracle.py (mpmath)"},
    {"band-temperature exitances",
     "/v1/band-temperature?band=8,14&exitance=frame",
     {62.0157802011f, 10.0f, 500.0f}, 3, 3,
     {244.422680677, 181.904708417, 388.540034085}, 0.0, "0", false, {0},
     "tests/integration/oracle.py (mpmath)"},
    {"band-temperature with an emissivity map",
     "/v1/band-temperature?emissivity=map",
     {10.0f, 10.0f, 1.0f, 0.9f}, 4, 2,
     {217.034625996, 220.899282764}, 0.0, "0", false, {0},
     "tests/integration/oracle.py (mpmath)"},
    {"brightness temperature at 11 um",
     "/v1/brightness-temperature?wavelength=11",
     {9.2f, 1.0f}, 2, 2,
     {297.322438059, 197.957130577}, 0.0, "0", false, {0},
     "tests/integration/oracle.py (mpmath); REFERENCES.md gives 297.322439 K for 9.20"},
    {"brightness temperature per nanometre",
     "/v1/brightness-temperature?wavelength=11000&wavelength_unit=nm",
     {0.0092f}, 1, 1,
     {297.322440924}, 0.0, "0", false, {0},
     "tests/integration/oracle.py (mpmath)"},
    {"Sakuma-Hattori calibration with the status plane: signals 0 and below have no answer",
     "/v1/calibration/apply?status_plane=true&" CALIBRATION_HANDHELD,
     {1000.0f, 9000.0f, 0.0f, -12.0f}, 4, 4,
     /* mpmath, 30 digits: T = (c2 / ln(1 + C/S) - B) / A, c2 = 14387.76877 um K (CODATA 2018) */
     {312.242530140, 588.402894657, 0.0, 0.0}, 0.0, "2", true, {0, 0, 1, 1},
     "mpmath, closed-form Sakuma-Hattori inverse"},
    {"Sakuma-Hattori calibration in Celsius, width x height given",
     "/v1/calibration/apply?temperature_unit=C&signal=frame&width=3&height=1&"
     CALIBRATION_HANDHELD,
     {1000.0f, 4200.0f, 9000.0f}, 3, 3,
     {39.0925301403, 181.064321856, 315.252894657}, 0.0, "0", false, {0},
     "mpmath, closed-form Sakuma-Hattori inverse"},
    {"band calibration: exact band inversion, a signal below the offset has no answer",
     "/v1/calibration/apply?" CALIBRATION_LWIR,
     {25966.752118959765f, 50168.91875284315f, 117461.5882295673f, 1000.0f}, 4, 4,
     /* band_temperature((S - offset) / gain) at the float32 signals */
     {263.149999655, 303.149998930, 373.149998070, 0.0}, 0.0, "1", false, {0},
     "tests/integration/oracle.py (mpmath)"},
};

static void check_answer(const frame_case *c)
{
    http_response response;
    char value[64];
    post_floats(c->path, c->pixels, c->count, &response);
    if (response.status != 200) {
        fail_msg("%s: status %ld, body %s", c->name, response.status, body_of(&response));
    }
    assert_true(http_response_header(&response, "Content-Type", value, sizeof value));
    assert_string_equal(value, "application/octet-stream");
    assert_true(http_response_header(&response, "Greybody-Unresolved-Pixels", value,
                                     sizeof value));
    assert_string_equal(value, c->unresolved);
    size_t expected_length = 4 * c->answers + (c->status_plane ? c->answers : 0);
    assert_int_equal(response.body.length, expected_length);
    const unsigned char *bytes = (const unsigned char *)response.body.data;
    for (size_t i = 0; i < c->answers; i++) {
        double got = decode(bytes + 4 * i);
        double want = c->expected[i];
        bool unresolved = c->status_plane && c->codes[i] != 0;
        if (unresolved) {
            want = 0.0; /* absolute zero in kelvin, the documented fill */
        }
        double tolerance = FLOAT_STEP * fabs(want) + c->input_slack;
        assert_true(isfinite(got));
        if (!(fabs(got - want) <= tolerance)) {
            fail_msg("%s: pixel %zu is %.9g, expected %.9g +- %.2g (%s)", c->name, i, got, want,
                     tolerance, c->source);
        }
        if (c->status_plane) {
            assert_int_equal(bytes[4 * c->answers + i], c->codes[i]);
        }
    }
    http_response_free(&response);
}

static void answers_match_outside_values(void **state)
{
    (void)state;
    for (size_t i = 0; i < sizeof answer_cases / sizeof answer_cases[0]; i++) {
        check_answer(&answer_cases[i]);
    }
}

static void unresolved_pixels_are_absolute_zero_in_the_unit(void **state)
{
    /* emissivity 0 in the map: no answer; absolute zero is -459.67 F (ITS-90 relation). */
    static const float pixels[] = {90.0f, 0.0f};
    http_response response;
    (void)state;
    post_floats("/v1/corrected-temperature?emissivity=map&reflected_temperature=68"
                "&temperature_unit=F",
                pixels, 2, &response);
    assert_int_equal(response.status, 200);
    assert_int_equal(response.body.length, 4);
    assert_float_equal(decode((const unsigned char *)response.body.data), -459.67, 1e-4);
    char value[16];
    assert_true(http_response_header(&response, "Greybody-Temperature-Unit", value, sizeof value));
    assert_string_equal(value, "F");
    http_response_free(&response);
}

/* ---- refusals ------------------------------------------------------------------- */

typedef struct refusal_case {
    const char *name;
    const char *path;
    const unsigned char *raw; /* a raw body, or NULL to encode `pixels` */
    size_t raw_length;
    float pixels[4];
    size_t count;
    long status;
    const char *code;
    const char *field;
} refusal_case;

static const unsigned char five_bytes[] = {0, 0, 0x9a, 0x43, 0};

#define CORRECTED "/v1/corrected-temperature?emissivity=0.95&reflected_temperature=293.15"

static const refusal_case refusal_cases[] = {
    {"not whole float32 values", CORRECTED, five_bytes, sizeof five_bytes, {0}, 0, 400,
     "array_length_mismatch", "body"},
    {"empty body", CORRECTED, five_bytes, 0, {0}, 0, 400, "empty_array", "body"},
    {"NaN pixel", CORRECTED, NULL, 0, {300.0f, NAN}, 2, 400, "not_finite",
     "apparent_temperature"},
    {"infinite emissivity in the map",
     "/v1/corrected-temperature?emissivity=map&reflected_temperature=293.15", NULL, 0,
     {300.0f, 301.0f, 0.9f, INFINITY}, 4, 400, "not_finite", "emissivity"},
    {"map plane of another size",
     "/v1/corrected-temperature?emissivity=map&reflected_temperature=293.15", NULL, 0,
     {300.0f, 301.0f, 0.9f}, 3, 400, "array_length_mismatch", "emissivity"},
    {"width x height not the pixel count", CORRECTED "&width=2&height=2", NULL, 0,
     {300.0f, 301.0f, 302.0f}, 3, 400, "array_length_mismatch", "height"},
    {"rows not whole", CORRECTED "&width=2", NULL, 0, {300.0f, 301.0f, 302.0f}, 3, 400,
     "array_length_mismatch", "width"},
    {"width not a number", CORRECTED "&width=two", NULL, 0, {300.0f}, 1, 400, "invalid_query",
     "width"},
    {"signal given as a number", CORRECTED "&apparent_temperature=300", NULL, 0, {300.0f}, 1,
     400, "conflicting_fields", "apparent_temperature"},
    {"scalar emissivity out of range",
     "/v1/corrected-temperature?emissivity=1.5&reflected_temperature=293.15", NULL, 0,
     {300.0f}, 1, 422, "emissivity_out_of_range", "emissivity"},
    {"reflected temperature missing", "/v1/corrected-temperature?emissivity=0.9", NULL, 0,
     {300.0f}, 1, 400, "missing_field", "reflected_temperature"},
    {"unknown field", CORRECTED "&colour=red", NULL, 0, {300.0f}, 1, 400, "unknown_field",
     "colour"},
    {"status_plane not a boolean", CORRECTED "&status_plane=maybe", NULL, 0, {300.0f}, 1, 400,
     "invalid_query", "status_plane"},
    {"reversed band", "/v1/band-temperature?band=14,8", NULL, 0, {10.0f}, 1, 422,
     "band_reversed", "band"},
    {"wavelength missing", "/v1/brightness-temperature", NULL, 0, {10.0f}, 1, 400,
     "missing_field", "wavelength"},
    {"calibration missing", "/v1/calibration/apply?temperature_unit=C", NULL, 0, {1000.0f}, 1,
     400, "missing_field", "calibration"},
    {"calibration not JSON", "/v1/calibration/apply?calibration=%7Bmodel", NULL, 0, {1000.0f}, 1,
     400, "malformed_json", "calibration"},
    {"calibration without parameters",
     "/v1/calibration/apply?calibration=%7B%22model%22%3A%22sakuma-hattori%22%7D", NULL, 0,
     {1000.0f}, 1, 400, "missing_field", "calibration.parameters"},
    {"calibration frame not whole float32 values", "/v1/calibration/apply?" CALIBRATION_HANDHELD,
     five_bytes, sizeof five_bytes, {0}, 0, 400, "array_length_mismatch", "body"},
    {"calibration frame of another width", "/v1/calibration/apply?width=2&" CALIBRATION_HANDHELD,
     NULL, 0, {1000.0f, 2000.0f, 3000.0f}, 3, 400, "array_length_mismatch", "width"},
    {"calibration frame with an emissivity map",
     "/v1/calibration/apply?emissivity=map&" CALIBRATION_HANDHELD, NULL, 0, {1000.0f, 0.9f}, 2,
     400, "unknown_field", "emissivity"},
    {"per-pixel signal uncertainty", "/v1/calibration/apply?u_signal=3&" CALIBRATION_HANDHELD,
     NULL, 0, {1000.0f}, 1, 400, "unknown_field", "u_signal"},
    {"NaN signal", "/v1/calibration/apply?" CALIBRATION_HANDHELD, NULL, 0, {1000.0f, NAN}, 2,
     400, "not_finite", "signal"},
};

static void check_refusal(const refusal_case *c)
{
    http_response response;
    char value[128];
    if (c->raw != NULL) {
        post_frame(c->path, c->raw, c->raw_length, &response);
    } else {
        post_floats(c->path, c->pixels, c->count, &response);
    }
    if (response.status != c->status) {
        fail_msg("%s: status %ld (expected %ld), body %s", c->name, response.status, c->status,
                 body_of(&response));
    }
    assert_true(http_response_header(&response, "Content-Type", value, sizeof value));
    assert_string_equal(value, "application/problem+json");
    char code[96], field[96];
    snprintf(code, sizeof code, "\"code\":\"%s\"", c->code);
    snprintf(field, sizeof field, "\"field\":\"%s\"", c->field);
    if (strstr(body_of(&response), code) == NULL || strstr(body_of(&response), field) == NULL) {
        fail_msg("%s: expected %s and %s in %s", c->name, code, field, body_of(&response));
    }
    http_response_free(&response);
}

static void bad_frames_get_problems_naming_the_field(void **state)
{
    (void)state;
    for (size_t i = 0; i < sizeof refusal_cases / sizeof refusal_cases[0]; i++) {
        check_refusal(&refusal_cases[i]);
    }
}

static void too_many_pixels_is_413(void **state)
{
    static float pixels[1001];
    http_response response;
    (void)state;
    for (size_t i = 0; i < 1001; i++) {
        pixels[i] = 300.0f;
    }
    post_floats(CORRECTED, pixels, 1001, &response);
    assert_int_equal(response.status, 413);
    assert_non_null(strstr(body_of(&response), "\"code\":\"array_too_long\""));
    http_response_free(&response);
    post_floats("/v1/calibration/apply?" CALIBRATION_HANDHELD, pixels, 1001, &response);
    assert_int_equal(response.status, 413);
    assert_non_null(strstr(body_of(&response), "\"code\":\"array_too_long\""));
    http_response_free(&response);
}

static void json_form_still_answers_json(void **state)
{
    /* The octet-stream hook must leave the JSON form of the same route alone. */
    static const char body[] =
        "{\"apparent_temperature\": 308.15, \"emissivity\": 0.95, \"reflected_temperature\": "
        "293.15}";
    char url[256], error[256];
    http_response response;
    struct curl_slist *headers = curl_slist_append(NULL, "Content-Type: application/json");
    (void)state;
    snprintf(url, sizeof url, "%s/v1/corrected-temperature", server.base_url);
    assert_true(http_client_exchange(client, url, "POST", headers, body, sizeof body - 1, NULL,
                                     &response, error, sizeof error));
    curl_slist_free_all(headers);
    assert_int_equal(response.status, 200);
    assert_non_null(strstr(body_of(&response), "\"temperature\":308.88682"));
    http_response_free(&response);
}

/* ---- the whole run ---------------------------------------------------------------- */

static int start(void **state)
{
    static const char *const args[] = {"--max-array", SERVER_MAX_ARRAY, NULL};
    (void)state;
    curl_global_init(CURL_GLOBAL_DEFAULT);
    client = curl_easy_init();
    return client != NULL && greybodyd_start(&server, "frames", "http", args) ? 0 : -1;
}

static int stop(void **state)
{
    int exit_status = -1;
    (void)state;
    bool stopped = greybodyd_stop(&server, &exit_status);
    curl_easy_cleanup(client);
    curl_global_cleanup();
    return stopped && exit_status == 0 ? 0 : -1;
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(answers_match_outside_values),
        cmocka_unit_test(unresolved_pixels_are_absolute_zero_in_the_unit),
        cmocka_unit_test(bad_frames_get_problems_naming_the_field),
        cmocka_unit_test(too_many_pixels_is_413),
        cmocka_unit_test(json_form_still_answers_json),
    };
    return cmocka_run_group_tests_name("frames over HTTP", tests, start, stop);
}
