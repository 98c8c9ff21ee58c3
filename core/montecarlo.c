#include "montecarlo.h"

#include <math.h>
#include <stdlib.h>

#include "constants.h"

/* Redraws allowed per input before a distribution is judged to sit outside its domain. */
#define MAX_REDRAWS 1000
#define SQRT3 1.7320508075688772935

typedef struct random_state {
    uint64_t word[4];
} random_state;

static uint64_t splitmix64(uint64_t *state)
{
    uint64_t z = (*state += 0x9e3779b97f4a7c15ULL);
    z = (z ^ (z >> 30)) * 0xbf58476d1ce4e5b9ULL;
    z = (z ^ (z >> 27)) * 0x94d049bb133111ebULL;
    return z ^ (z >> 31);
}

static uint64_t rotate_left(uint64_t x, int k)
{
    return (x << k) | (x >> (64 - k));
}

static uint64_t next_random(random_state *state)
{
    uint64_t *s = state->word;
    uint64_t result = rotate_left(s[1] * 5, 7) * 9;
    uint64_t t = s[1] << 17;
    s[2] ^= s[0];
    s[3] ^= s[1];
    s[1] ^= s[2];
    s[0] ^= s[3];
    s[2] ^= t;
    s[3] = rotate_left(s[3], 45);
    return result;
}

/* Uniform in the open interval (0, 1): 53 random bits, offset by half a step. */
static double uniform_open(random_state *state)
{
    return ((double)(next_random(state) >> 11) + 0.5) * 0x1.0p-53;
}

static double standard_normal(random_state *state)
{
    double radius = sqrt(-2.0 * log(uniform_open(state)));
    return radius * cos(2.0 * GB_PI * uniform_open(state));
}

static double deviate(gb_distribution distribution, double u, random_state *state)
{
    switch (distribution) {
    case GB_DISTRIBUTION_NORMAL: return u * standard_normal(state);
    case GB_DISTRIBUTION_RECTANGULAR: return SQRT3 * u * (2.0 * uniform_open(state) - 1.0);
    case GB_DISTRIBUTION_NONE: break;
    }
    return 0.0;
}

/* The domain each input's draws are truncated to. */
static int inside_domain(gb_input input, const gb_scene *scene, double value)
{
    switch (input) {
    case GB_INPUT_EMISSIVITY:
    case GB_INPUT_TRANSMITTANCE: return value > 0.0 && value <= 1.0;
    case GB_INPUT_REFLECTED:
        return scene->reflected.kind == GB_TERM_TEMPERATURE ? value > 0.0 : value >= 0.0;
    case GB_INPUT_ATMOSPHERE:
        return scene->atmosphere.kind == GB_TERM_TEMPERATURE ? value > 0.0 : value >= 0.0;
    case GB_INPUT_SIGNAL: return value > 0.0;
    case GB_INPUT_COUNT: break;
    }
    return 0;
}

static double *scene_field(gb_scene *scene, gb_input input)
{
    switch (input) {
    case GB_INPUT_EMISSIVITY: return &scene->emissivity;
    case GB_INPUT_REFLECTED: return &scene->reflected.value;
    case GB_INPUT_TRANSMITTANCE: return &scene->transmittance;
    case GB_INPUT_ATMOSPHERE: return &scene->atmosphere.value;
    case GB_INPUT_SIGNAL: return &scene->signal.value;
    case GB_INPUT_COUNT: break;
    }
    return NULL;
}

static gb_status check_input(const gb_scene *scene, const gb_monte_carlo_input *input)
{
    for (int i = 0; i < GB_INPUT_COUNT; ++i) {
        double u = input->standard_uncertainty[i];
        gb_distribution distribution = input->distribution[i];
        if (distribution != GB_DISTRIBUTION_NONE && distribution != GB_DISTRIBUTION_NORMAL &&
            distribution != GB_DISTRIBUTION_RECTANGULAR) {
            return GB_ERR_DISTRIBUTION_UNKNOWN;
        }
        if (!isfinite(u)) {
            return GB_ERR_NOT_FINITE;
        }
        if (u < 0.0) {
            return GB_ERR_UNCERTAINTY_DOMAIN;
        }
        /* An absent atmosphere temperature (tau = 1) cannot be varied, nor tau around it. */
        if (u > 0.0 && distribution != GB_DISTRIBUTION_NONE &&
            (i == GB_INPUT_TRANSMITTANCE || i == GB_INPUT_ATMOSPHERE) &&
            scene->atmosphere.kind == GB_TERM_TEMPERATURE && isnan(scene->atmosphere.value)) {
            return GB_ERR_INVALID_ARGUMENT;
        }
    }
    return GB_OK;
}

/* One draw of the scene; GB_ERR_UNCERTAINTY_DOMAIN if an input never lands in its domain. */
static gb_status draw_scene(const gb_scene *scene, const gb_monte_carlo_input *input,
                            random_state *state, gb_scene *drawn)
{
    *drawn = *scene;
    for (int i = 0; i < GB_INPUT_COUNT; ++i) {
        gb_distribution distribution = input->distribution[i];
        double u = input->standard_uncertainty[i];
        double *field = scene_field(drawn, (gb_input)i);
        double centre = *field;
        int attempt = 0;
        if (distribution == GB_DISTRIBUTION_NONE || u == 0.0) {
            continue;
        }
        do {
            if (++attempt > MAX_REDRAWS) {
                return GB_ERR_UNCERTAINTY_DOMAIN;
            }
            *field = centre + deviate(distribution, u, state);
        } while (!inside_domain((gb_input)i, scene, *field));
    }
    return GB_OK;
}

static int compare_doubles(const void *a, const void *b)
{
    double x = *(const double *)a, y = *(const double *)b;
    return (x > y) - (x < y);
}

/* The p-quantile of n sorted values, by the JCGM 101 7.7 rule of the order statistic. */
static double quantile(const double *sorted, size_t n, double p)
{
    double position = p * (double)n;
    size_t index = (size_t)floor(position + 0.5);
    if (index < 1) {
        index = 1;
    }
    if (index > n) {
        index = n;
    }
    return sorted[index - 1];
}

gb_status gb_monte_carlo(const gb_band *band, const gb_scene *scene,
                         const gb_monte_carlo_input *input, size_t draws, uint64_t seed,
                         double *workspace, gb_monte_carlo_result *result)
{
    random_state state;
    gb_monte_carlo_result answer = {0};
    uint64_t seeder = seed;
    double centre_temperature, sum = 0.0, sum_of_squares = 0.0;
    size_t used = 0;
    gb_status status;
    if (scene == NULL || input == NULL || workspace == NULL || result == NULL) {
        return GB_ERR_INVALID_ARGUMENT;
    }
    if (draws < GB_MONTE_CARLO_MIN_DRAWS || draws > GB_MONTE_CARLO_MAX_DRAWS) {
        return GB_ERR_DRAW_COUNT;
    }
    status = check_input(scene, input);
    if (status == GB_OK) {
        status = gb_measure_temperature(band, scene, &centre_temperature);
    }
    if (status != GB_OK) {
        return status;
    }
    for (int i = 0; i < 4; ++i) {
        state.word[i] = splitmix64(&seeder);
    }
    for (size_t draw = 0; draw < draws; ++draw) {
        gb_scene drawn;
        double temperature;
        status = draw_scene(scene, input, &state, &drawn);
        if (status != GB_OK) {
            return status;
        }
        if (gb_measure_temperature(band, &drawn, &temperature) != GB_OK) {
            answer.unsolvable_draws++;
            continue;
        }
        /* Sums about the central answer keep the variance free of cancellation. */
        sum += temperature - centre_temperature;
        sum_of_squares += (temperature - centre_temperature) * (temperature - centre_temperature);
        workspace[used++] = temperature;
    }
    if (used < GB_MONTE_CARLO_MIN_DRAWS) {
        return GB_ERR_NET_SIGNAL_NOT_POSITIVE;
    }
    qsort(workspace, used, sizeof workspace[0], compare_doubles);
    answer.used_draws = used;
    answer.mean_k = centre_temperature + sum / (double)used;
    answer.standard_deviation_k =
        sqrt(fmax(0.0, (sum_of_squares - sum * sum / (double)used) / (double)(used - 1)));
    answer.coverage_low_k = quantile(workspace, used, (1.0 - GB_MONTE_CARLO_COVERAGE) / 2.0);
    answer.coverage_high_k = quantile(workspace, used, (1.0 + GB_MONTE_CARLO_COVERAGE) / 2.0);
    *result = answer;
    return GB_OK;
}
