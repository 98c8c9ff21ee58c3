#include "datapath.h"

#include <stdio.h>
#include <string.h>
#include <unistd.h>

size_t gb_data_path_candidates(const char *configured, const char *relative,
                               char out[GB_DATA_PATH_CANDIDATES][PATH_MAX])
{
    if (configured != NULL && configured[0] != '\0') {
        snprintf(out[0], PATH_MAX, "%s", configured);
        return 1;
    }
    snprintf(out[0], PATH_MAX, "%s", relative);
    char exe[PATH_MAX];
    ssize_t n = readlink("/proc/self/exe", exe, sizeof exe - 1);
    if (n <= 0) {
        return 1;
    }
    exe[n] = '\0';
    char *slash = strrchr(exe, '/');
    if (slash == NULL) {
        return 1;
    }
    *slash = '\0'; /* the binary's directory, e.g. /repo/build */
    slash = strrchr(exe, '/');
    if (slash != NULL) {
        *slash = '\0'; /* its parent, e.g. /repo */
    }
    snprintf(out[1], PATH_MAX, "%.3800s/%s", exe[0] ? exe : "", relative);
    /* Installed by `make install`: PREFIX/bin/greybodyd reads PREFIX/share/greybody/<relative>. */
    snprintf(out[2], PATH_MAX, "%.3800s/share/greybody/%s", exe[0] ? exe : "", relative);
    return 3;
}
