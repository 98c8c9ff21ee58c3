/*
 * frames.h — whole thermal frames over HTTP, without JSON.
 *
 * POST /v1/corrected-temperature, /v1/band-temperature,
 * /v1/brightness-temperature or /v1/calibration/apply with Content-Type:
 * application/octet-stream: the body is a plane of little-endian IEEE 754
 * float32 pixels, row after row, and the scalar inputs are query parameters
 * named as in the JSON form (calibration/apply's `calibration` as its JSON
 * text, as for CSV).
 *   - The first plane holds the endpoint's signal (apparent_temperature for
 *     corrected-temperature, radiance for band- and brightness-temperature,
 *     the instrument's signal for calibration/apply); name another signal
 *     form by giving it the value "frame" (measured_radiance=frame,
 *     exitance=frame).
 *   - calibration/apply returns no per-pixel uncertainty (u_signal is
 *     refused); its JSON and CSV forms do.
 *   - emissivity=map: a second plane of the same size follows the first and
 *     holds each pixel's emissivity (the body is 2 x N floats).
 *   - width, height (optional): checked against the pixel count.
 *   - status_plane=true: after the temperatures, one byte per pixel tells why
 *     a pixel has no answer (codes below).
 * The answer (200, application/octet-stream) is N little-endian float32
 * temperatures in the request's temperature_unit, same order.  A pixel
 * without an answer holds absolute zero in that unit (0 K, -273.15 C,
 * -459.67 F) -- never NaN -- and the header Greybody-Unresolved-Pixels
 * counts them (0 for a clean frame, so most clients need nothing more).
 * Status-plane codes: 0 answered; 1 an input out of its domain (emissivity
 * outside (0, 1], temperature or radiance out of range, a signal no
 * temperature gives under the calibration); 2 net signal not
 * positive (reflected and atmospheric terms exceed the signal); 3 result out
 * of the solver's range.
 * Errors are problem documents as for JSON: a body that is not whole float32
 * values, planes of unequal size or a width x height that does not match ->
 * 400 array_length_mismatch naming body, emissivity, width or height; a NaN or
 * infinite pixel -> 400 not_finite naming the plane with the pixel's index;
 * more pixels than --max-array -> 413 array_too_long.
 */
#ifndef GREYBODY_FRAMES_H
#define GREYBODY_FRAMES_H

#include <stdbool.h>
#include <stddef.h>

#include "reply.h"
#include "request.h"
#include "router.h"

#define GB_CONTENT_FRAME "application/octet-stream"

/* True for a POST of application/octet-stream to a route that converts frames. */
bool gb_frames_accepts(const gb_route *route, const char *content_type);

/*
 * Serves one frame request.  Takes the body (*body is set to NULL): the
 * answer is written over it and becomes the response, so a frame costs no
 * allocation beyond its body (and the status plane's bytes when asked for).
 */
void gb_frames_serve(gb_context *context, struct MHD_Connection *connection,
                     const gb_route *route, char **body, size_t length, bool body_too_large,
                     gb_heavy_work *heavy, gb_reply *reply);

#endif
