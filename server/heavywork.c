#include "heavywork.h"

#include <errno.h>
#include <time.h>

bool gb_heavy_work_enter(gb_heavy_work *work)
{
    if (work == NULL || work->slots == NULL || work->held) {
        return true;
    }
    struct timespec deadline;
    clock_gettime(CLOCK_REALTIME, &deadline);
    deadline.tv_sec += (time_t)work->wait_seconds;
    for (;;) {
        if (sem_timedwait(work->slots, &deadline) == 0) {
            work->held = true;
            return true;
        }
        if (errno != EINTR) {
            return false;
        }
    }
}

void gb_heavy_work_leave(gb_heavy_work *work)
{
    if (work != NULL && work->held) {
        sem_post(work->slots);
        work->held = false;
    }
}

void gb_heavy_work_refused(gb_problem *problem, const char *what)
{
    gb_problem_set(problem, GB_PROBLEM_OVERLOADED, NULL,
                   "Too many %s are being computed; retry shortly.", what);
}
