#include "router.h"

#include <string.h>

#include "handlers.h"

#define COMPUTE_METHODS (GB_METHOD_GET | GB_METHOD_HEAD | GB_METHOD_POST | GB_METHOD_OPTIONS)
#define COMPUTE_ALLOW "GET, HEAD, POST, OPTIONS"
#define OPS_METHODS (GB_METHOD_GET | GB_METHOD_HEAD | GB_METHOD_OPTIONS)
#define OPS_ALLOW "GET, HEAD, OPTIONS"

#define COMPUTE(path, handler) {path, COMPUTE_METHODS, COMPUTE_ALLOW, GB_ROUTE_COMPUTE, handler}
#define OPS(path, handler) {path, OPS_METHODS, OPS_ALLOW, GB_ROUTE_OPS, handler}

static const gb_route routes[] = {
    COMPUTE("/v1/radiance", gb_handle_radiance),
    COMPUTE("/v1/brightness-temperature", gb_handle_brightness_temperature),
    COMPUTE("/v1/peak", gb_handle_peak),
    COMPUTE("/v1/band", gb_handle_band),
    COMPUTE("/v1/band-temperature", gb_handle_band_temperature),
    COMPUTE("/v1/corrected-temperature", gb_handle_corrected_temperature),
    COMPUTE("/v1/sensitivity", gb_handle_sensitivity),
    COMPUTE("/v1/emissivity", gb_handle_emissivity),
    COMPUTE("/v1/ratio-temperature", gb_handle_ratio_temperature),
    COMPUTE("/v1/spectrum", gb_handle_spectrum),
    /* POST only: the points are an array of objects, which a query string cannot carry. */
    {"/v1/calibration/fit", GB_METHOD_POST | GB_METHOD_OPTIONS, "POST, OPTIONS", GB_ROUTE_COMPUTE,
     gb_handle_calibration_fit},
    COMPUTE("/v1/calibration/apply", gb_handle_calibration_apply),
    OPS("/v1/presets", gb_handle_presets), /* read-only: GET, HEAD, OPTIONS */
    OPS("/healthz", gb_handle_healthz),
    OPS("/readyz", gb_handle_readyz),
    OPS("/version", gb_handle_version),
    OPS("/metrics", gb_handle_metrics),
    OPS("/openapi.json", gb_handle_openapi),
    OPS("/", gb_handle_page),
};

#define ROUTE_COUNT (sizeof routes / sizeof routes[0])

gb_method gb_method_parse(const char *name)
{
    if (strcmp(name, "GET") == 0) {
        return GB_METHOD_GET;
    }
    if (strcmp(name, "HEAD") == 0) {
        return GB_METHOD_HEAD;
    }
    if (strcmp(name, "POST") == 0) {
        return GB_METHOD_POST;
    }
    if (strcmp(name, "OPTIONS") == 0) {
        return GB_METHOD_OPTIONS;
    }
    return GB_METHOD_OTHER;
}

size_t gb_route_count(void)
{
    return ROUTE_COUNT;
}

const gb_route *gb_route_at(size_t i)
{
    return i < ROUTE_COUNT ? &routes[i] : NULL;
}

const char *gb_route_path(size_t i)
{
    return i < ROUTE_COUNT ? routes[i].path : NULL;
}

const char *gb_route_methods(size_t i)
{
    return i < ROUTE_COUNT ? routes[i].allow : NULL;
}

size_t gb_route_find(const char *path)
{
    for (size_t i = 0; i < ROUTE_COUNT; i++) {
        if (strcmp(path, routes[i].path) == 0) {
            return i;
        }
    }
    return GB_ROUTE_NONE;
}
