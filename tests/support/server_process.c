#include "server_process.h"

#include <arpa/inet.h>
#include <errno.h>
#include <fcntl.h>
#include <netinet/in.h>
#include <signal.h>
#include <stdio.h>
#include <string.h>
#include <sys/socket.h>
#include <sys/wait.h>
#include <time.h>
#include <unistd.h>

#define POLL_INTERVAL_NS 25000000L

static void sleep_one_poll(void)
{
    struct timespec interval = {0, POLL_INTERVAL_NS};
    nanosleep(&interval, NULL);
}

int server_process_free_port(void)
{
    int fd = socket(AF_INET, SOCK_STREAM, 0);
    if (fd < 0) {
        return -1;
    }
    struct sockaddr_in address;
    memset(&address, 0, sizeof address);
    address.sin_family = AF_INET;
    address.sin_addr.s_addr = htonl(INADDR_LOOPBACK);
    socklen_t length = sizeof address;
    int port = -1;
    if (bind(fd, (struct sockaddr *)&address, sizeof address) == 0
        && getsockname(fd, (struct sockaddr *)&address, &length) == 0) {
        port = ntohs(address.sin_port);
    }
    close(fd);
    return port;
}

bool server_process_spawn(server_process *process, char *const argv[], const char *log_path)
{
    process->exited = false;
    process->wait_status = 0;
    process->pid = fork();
    if (process->pid < 0) {
        return false;
    }
    if (process->pid > 0) {
        return true;
    }
    int log_fd = open(log_path, O_WRONLY | O_CREAT | O_APPEND, 0644);
    if (log_fd >= 0) {
        dup2(log_fd, STDOUT_FILENO);
        dup2(log_fd, STDERR_FILENO);
        close(log_fd);
    }
    execv(argv[0], argv);
    fprintf(stderr, "server_process: cannot run %s: %s\n", argv[0], strerror(errno));
    _exit(127);
}

bool server_process_has_exited(server_process *process)
{
    if (process->pid < 0 || process->exited) {
        return true;
    }
    if (waitpid(process->pid, &process->wait_status, WNOHANG) == process->pid) {
        process->exited = true;
    }
    return process->exited;
}

bool server_process_wait_ready(server_process *process, bool (*is_ready)(void *context),
                               void *context, int polls)
{
    for (int poll = 0; poll < polls; poll++) {
        if (server_process_has_exited(process)) {
            return false;
        }
        if (is_ready(context)) {
            return true;
        }
        sleep_one_poll();
    }
    return false;
}

bool server_process_terminate(server_process *process, int polls)
{
    if (server_process_has_exited(process)) {
        return true;
    }
    if (kill(process->pid, SIGTERM) != 0) {
        return false;
    }
    for (int poll = 0; poll < polls; poll++) {
        if (server_process_has_exited(process)) {
            return true;
        }
        sleep_one_poll();
    }
    return server_process_has_exited(process);
}

void server_process_kill(server_process *process)
{
    if (!server_process_has_exited(process)) {
        kill(process->pid, SIGKILL);
        waitpid(process->pid, &process->wait_status, 0);
        process->exited = true;
    }
}
