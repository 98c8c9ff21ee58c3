/*
 * tablecache.h — band tables (core/bandtable.h) shared by every request that
 * converts frames in the same band and temperature range.
 *
 * A fixed number of slots, each a built table behind its own read-write lock
 * (lock striping: the key picks the slot, so requests for different bands
 * rarely meet and no lock covers the whole cache).  A request holds its
 * slot's read lock while it converts, so a table is never rebuilt under a
 * reader; a miss builds into the slot under the write lock (~3 ms), evicting
 * whatever that slot held.  Each slot's table is allocated once, on its first
 * use, and reused: memory is bounded by GB_TABLE_CACHE_SLOTS tables and the
 * request path allocates nothing.
 */
#ifndef GREYBODY_TABLECACHE_H
#define GREYBODY_TABLECACHE_H

#include <stdbool.h>

#include "band.h"
#include "bandtable.h"

#define GB_TABLE_CACHE_SLOTS 8

typedef struct gb_table_lease {
    const gb_band_table *table; /* NULL: no table (exact band functions instead) */
    unsigned slot;
} gb_table_lease;

/*
 * The table for a flat band (wavelength or wavenumber limits) over
 * [t_min, t_max], read-locked until gb_table_cache_release.  false (and
 * lease->table NULL) when the band has no table (total, response) or the
 * table cannot be built; the caller then uses the exact functions.
 */
bool gb_table_cache_acquire(const gb_band *band, double t_min, double t_max,
                            gb_table_lease *lease);
void gb_table_cache_release(gb_table_lease *lease);

#endif
