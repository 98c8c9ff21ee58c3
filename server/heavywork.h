/*
 * heavywork.h — the bound on heavy work computed at once (--max-batches).
 *
 * Large request bodies, and requests that ask for much computation (many
 * Monte Carlo draws, long spectra), take a slot of one counting semaphore so
 * that they cannot starve small requests of the CPU.  A request holds at most
 * one slot, whichever part of it asks first; one that finds no slot free
 * within `wait_seconds` is answered 503 overloaded with Retry-After.
 *
 * Ownership: the semaphore belongs to the server (request.h, gb_context);
 * a gb_heavy_work lives on the stack of one request and is left by the
 * request code when the handler returns.
 */
#ifndef GREYBODY_HEAVYWORK_H
#define GREYBODY_HEAVYWORK_H

#include <semaphore.h>
#include <stdbool.h>

#include "problem.h"

typedef struct gb_heavy_work {
    sem_t *slots;          /* NULL: no bound (tests that call handlers directly) */
    unsigned wait_seconds; /* longest wait for a slot */
    bool held;
} gb_heavy_work;

/* Takes a slot unless one is held already; false when none came free in time. */
bool gb_heavy_work_enter(gb_heavy_work *work);

/* Gives the slot back, if one is held. */
void gb_heavy_work_leave(gb_heavy_work *work);

/* The 503 problem for a failed enter; `what` names the work, e.g. "Monte Carlo runs". */
void gb_heavy_work_refused(gb_problem *problem, const char *what);

#endif
