#include "raw_socket.h"

#include <arpa/inet.h>
#include <errno.h>
#include <netinet/in.h>
#include <poll.h>
#include <string.h>
#include <sys/socket.h>
#include <time.h>
#include <unistd.h>

int raw_connect(const char *source, int port)
{
    int fd = socket(AF_INET, SOCK_STREAM, 0);
    if (fd < 0) {
        return -1;
    }
    if (source != NULL) {
        struct sockaddr_in local;
        memset(&local, 0, sizeof local);
        local.sin_family = AF_INET;
        if (inet_pton(AF_INET, source, &local.sin_addr) != 1 ||
            (ntohl(local.sin_addr.s_addr) >> 24) != 127 ||
            bind(fd, (struct sockaddr *)&local, sizeof local) != 0) {
            close(fd);
            return -1;
        }
    }
    struct sockaddr_in server;
    memset(&server, 0, sizeof server);
    server.sin_family = AF_INET;
    server.sin_port = htons((unsigned short)port);
    server.sin_addr.s_addr = htonl(INADDR_LOOPBACK);
    if (connect(fd, (struct sockaddr *)&server, sizeof server) != 0) {
        close(fd);
        return -1;
    }
    return fd;
}

bool raw_send(int fd, const char *text, size_t length)
{
    while (length > 0) {
        ssize_t sent = send(fd, text, length, MSG_NOSIGNAL);
        if (sent < 0 && errno == EINTR) {
            continue;
        }
        if (sent <= 0) {
            return false;
        }
        text += sent;
        length -= (size_t)sent;
    }
    return true;
}

static long elapsed_ms(const struct timespec *start)
{
    struct timespec now;
    clock_gettime(CLOCK_MONOTONIC, &now);
    return (long)(now.tv_sec - start->tv_sec) * 1000 + (now.tv_nsec - start->tv_nsec) / 1000000;
}

bool raw_wait_closed(int fd, int milliseconds)
{
    struct timespec start;
    clock_gettime(CLOCK_MONOTONIC, &start);
    char sink[4096];
    for (;;) {
        long left = milliseconds - elapsed_ms(&start);
        if (left <= 0) {
            return false;
        }
        struct pollfd wanted = {fd, POLLIN, 0};
        int ready = poll(&wanted, 1, (int)left);
        if (ready < 0 && errno == EINTR) {
            continue;
        }
        if (ready <= 0) {
            return false;
        }
        ssize_t got = recv(fd, sink, sizeof sink, 0);
        if (got == 0 || (got < 0 && errno != EINTR && errno != EAGAIN)) {
            return true;
        }
    }
}

size_t raw_read(int fd, char *out, size_t size, int milliseconds)
{
    struct timespec start;
    clock_gettime(CLOCK_MONOTONIC, &start);
    size_t used = 0;
    while (used + 1 < size) {
        long left = milliseconds - elapsed_ms(&start);
        if (left <= 0) {
            break;
        }
        struct pollfd wanted = {fd, POLLIN, 0};
        if (poll(&wanted, 1, (int)left) <= 0) {
            break;
        }
        ssize_t got = recv(fd, out + used, size - 1 - used, 0);
        if (got <= 0) {
            break;
        }
        used += (size_t)got;
    }
    out[used] = '\0';
    return used;
}

void raw_close(int fd)
{
    if (fd >= 0) {
        close(fd);
    }
}
