/*
 * bench_core.c — times the core's array functions on one core, for
 * `make bench` (tools/bench/bench.py puts the table together).
 *
 * Each row runs one function over the same inputs that bench_numpy.py
 * builds (the same formulas), best of `rounds` runs, and prints
 *   row <TAB> seconds per element <TAB> elements
 * plus the floor: one exp() per element, in a loop compiled with the
 * project's own flags.  Every 997th result goes to <out>/core_<row>.f64 so
 * that the NumPy side can show both computed the same numbers.
 * Usage: bench_core OUTPUT_DIR [ROUNDS]
 */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <time.h>

#include "bandtable.h"
#include "batch.h"
#include "frame.h"

#define ELEMENTS 1000000
#define FRAME_WIDTH 640
#define FRAME_HEIGHT 512
#define SAMPLE_STRIDE 997
#define GOLDEN 0.6180339887498949
#define WAVELENGTH_UM 10.0
#define C2_UM_K 14387.76877503933

typedef struct inputs {
    double *temperature;       /* 250-400 K, in scrambled order */
    double *spectral_radiance; /* Planck at 10 um of those */
    double *band_radiance;     /* 8-14 um band radiance of those */
    double *exponent;          /* -c2 / (lambda T): the floor's arguments */
    float *apparent;           /* the same temperatures as float32 pixels */
    float *emissivity;         /* 0.80-0.98 */
    double *out;
    float *out_float;
    gb_status *status;
} inputs;

static double now(void)
{
    struct timespec t;
    clock_gettime(CLOCK_MONOTONIC, &t);
    return (double)t.tv_sec + (double)t.tv_nsec * 1e-9;
}

static double fraction_part(double x)
{
    return x - floor(x);
}

static void *checked_malloc(size_t bytes)
{
    void *p = malloc(bytes);
    if (p == NULL) {
        fprintf(stderr, "bench_core: out of memory\n");
        exit(1);
    }
    return p;
}

static void save_sample(const char *folder, const char *row, const double *values, size_t count)
{
    char path[1024];
    snprintf(path, sizeof path, "%s/core_%s.f64", folder, row);
    FILE *file = fopen(path, "wb");
    if (file == NULL) {
        return;
    }
    for (size_t i = 0; i < count; i += SAMPLE_STRIDE) {
        fwrite(&values[i], sizeof values[i], 1, file);
    }
    fclose(file);
}

static void save_sample_float(const char *folder, const char *row, const float *values,
                              size_t count, double *scratch)
{
    for (size_t i = 0; i < count; i++) {
        scratch[i] = values[i];
    }
    save_sample(folder, row, scratch, count);
}

/* The volatile sink keeps the compiler from dropping the floor loop. */
static volatile double sink;

static double time_floor(const inputs *in)
{
    double started = now();
    for (size_t i = 0; i < ELEMENTS; i++) {
        in->out[i] = exp(in->exponent[i]);
    }
    double elapsed = now() - started;
    sink = in->out[ELEMENTS / 2];
    return elapsed;
}

int main(int argc, char **argv)
{
    if (argc < 2) {
        fprintf(stderr, "usage: bench_core OUTPUT_DIR [ROUNDS]\n");
        return 2;
    }
    const char *folder = argv[1];
    int rounds = argc > 2 ? atoi(argv[2]) : 5;
    const double wavelength = WAVELENGTH_UM, one = 1.0;
    const gb_band band = {GB_BAND_WAVELENGTH, 8.0, 14.0, NULL, NULL, 0};
    static gb_band_table table;
    inputs in;
    in.temperature = checked_malloc(ELEMENTS * sizeof(double));
    in.spectral_radiance = checked_malloc(ELEMENTS * sizeof(double));
    in.band_radiance = checked_malloc(ELEMENTS * sizeof(double));
    in.exponent = checked_malloc(ELEMENTS * sizeof(double));
    in.out = checked_malloc(ELEMENTS * sizeof(double));
    in.apparent = checked_malloc(ELEMENTS * sizeof(float));
    in.emissivity = checked_malloc(ELEMENTS * sizeof(float));
    in.out_float = checked_malloc(ELEMENTS * sizeof(float));
    in.status = checked_malloc(ELEMENTS * sizeof(gb_status));

    double started = now();
    if (gb_band_table_build(&band, 150.0, 2000.0, &table) != GB_OK) {
        fprintf(stderr, "bench_core: table build failed\n");
        return 1;
    }
    printf("table_build\t%.6e\t1\n", now() - started);
    for (size_t i = 0; i < ELEMENTS; i++) {
        double t = 250.0 + 150.0 * fraction_part((double)i * GOLDEN);
        in.temperature[i] = t;
        in.exponent[i] = -C2_UM_K / (WAVELENGTH_UM * t);
        in.apparent[i] = (float)t;
        in.emissivity[i] = (float)(0.80 + 0.18 * fraction_part((double)i * GOLDEN * GOLDEN));
        (void)gb_planck_radiance(GB_WAVELENGTH, WAVELENGTH_UM, t, 1.0, &in.spectral_radiance[i]);
        (void)gb_band_radiance(&band, t, &in.band_radiance[i], NULL);
    }

    double best[7];
    for (size_t r = 0; r < 7; r++) {
        best[r] = INFINITY;
    }
    gb_scene scene = {{GB_TERM_TEMPERATURE, 0.0}, 1.0, {GB_TERM_TEMPERATURE, 293.15}, 1.0,
                      {GB_TERM_TEMPERATURE, NAN}};
    gb_frame_terms terms;
    if (gb_frame_prepare(&band, &scene, &terms) != GB_OK) {
        return 1;
    }
    for (int round = 0; round < rounds; round++) {
        best[0] = fmin(best[0], time_floor(&in));

        started = now();
        gb_batch_planck_radiance(GB_WAVELENGTH, ELEMENTS, GB_BROADCAST(&wavelength),
                                 GB_ARRAY(in.temperature), GB_BROADCAST(&one), in.out,
                                 in.status);
        best[1] = fmin(best[1], now() - started);
        if (round == 0) {
            save_sample(folder, "planck_radiance", in.out, ELEMENTS);
        }

        started = now();
        gb_batch_brightness_temperature(GB_WAVELENGTH, ELEMENTS, GB_BROADCAST(&wavelength),
                                        GB_ARRAY(in.spectral_radiance), GB_BROADCAST(&one),
                                        in.out, in.status);
        best[2] = fmin(best[2], now() - started);
        if (round == 0) {
            save_sample(folder, "brightness_temperature", in.out, ELEMENTS);
        }

        started = now();
        gb_band_table_radiance_array(&table, ELEMENTS, in.temperature, in.out, in.status);
        best[3] = fmin(best[3], now() - started);
        if (round == 0) {
            save_sample(folder, "band_radiance", in.out, ELEMENTS);
        }

        started = now();
        gb_band_table_temperature_array(&table, ELEMENTS, in.band_radiance, in.out, in.status);
        best[4] = fmin(best[4], now() - started);
        if (round == 0) {
            save_sample(folder, "band_temperature", in.out, ELEMENTS);
        }

        gb_frame frame = {ELEMENTS, in.apparent, GB_TERM_TEMPERATURE, 1.0, in.emissivity, 1.0,
                          GB_KELVIN, in.out_float, NULL, 0};
        started = now();
        gb_frame_measure_temperature(&band, &table, &terms, &frame);
        best[5] = fmin(best[5], now() - started);
        if (round == 0) {
            save_sample_float(folder, "corrected_temperature", in.out_float, ELEMENTS, in.out);
        }

        /* One 640 x 512 frame: the first rows of the same pixels. */
        gb_frame one_frame = {FRAME_WIDTH * FRAME_HEIGHT, in.apparent, GB_TERM_TEMPERATURE, 1.0,
                              in.emissivity, 1.0, GB_KELVIN, in.out_float, NULL, 0};
        started = now();
        gb_frame_measure_temperature(&band, &table, &terms, &one_frame);
        best[6] = fmin(best[6], now() - started);
    }
    printf("exp_floor\t%.6e\t%d\n", best[0] / ELEMENTS, ELEMENTS);
    printf("planck_radiance\t%.6e\t%d\n", best[1] / ELEMENTS, ELEMENTS);
    printf("brightness_temperature\t%.6e\t%d\n", best[2] / ELEMENTS, ELEMENTS);
    printf("band_radiance\t%.6e\t%d\n", best[3] / ELEMENTS, ELEMENTS);
    printf("band_temperature\t%.6e\t%d\n", best[4] / ELEMENTS, ELEMENTS);
    printf("corrected_temperature\t%.6e\t%d\n", best[5] / ELEMENTS, ELEMENTS);
    printf("frame_core\t%.6e\t%d\n", best[6], FRAME_WIDTH * FRAME_HEIGHT);
    return 0;
}
