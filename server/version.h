/* version.h — the service's name and version, reported by /version and --version. */
#ifndef GREYBODY_VERSION_H
#define GREYBODY_VERSION_H

#define GREYBODY_NAME "greybody"
#define GREYBODY_VERSION "0.1.0"

#endif
