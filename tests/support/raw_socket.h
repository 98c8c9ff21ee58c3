/*
 * raw_socket.h — plain TCP connections for tests that must misbehave as a
 * client (stay silent, trickle bytes, hang up mid-request), which libcurl
 * will not do.  Loopback only: the source address, when given, must be in
 * 127.0.0.0/8 (on Linux every such address reaches the loopback server, so a
 * test can play several clients).  Every wait is bounded.
 */
#ifndef GREYBODY_TEST_RAW_SOCKET_H
#define GREYBODY_TEST_RAW_SOCKET_H

#include <stdbool.h>
#include <stddef.h>

/* A connected socket to 127.0.0.1:port from `source` (NULL: any), or -1. */
int raw_connect(const char *source, int port);

/* Sends all of `text`; false when the peer has gone. */
bool raw_send(int fd, const char *text, size_t length);

/*
 * Waits up to `milliseconds` for the peer to close (end of stream or reset);
 * bytes that arrive meanwhile are read and dropped.  true when it closed.
 */
bool raw_wait_closed(int fd, int milliseconds);

/* Reads what arrives within `milliseconds` (up to size - 1 bytes, NUL-terminated); bytes read. */
size_t raw_read(int fd, char *out, size_t size, int milliseconds);

void raw_close(int fd);

#endif
