#include "tablecache.h"

#include <pthread.h>
#include <stdint.h>
#include <stdlib.h>
#include <string.h>

/* A table's identity: the flat band and the temperature range. */
typedef struct table_key {
    gb_band_kind kind;
    double lower, upper, t_min, t_max;
} table_key;

typedef struct slot {
    pthread_rwlock_t lock;
    bool valid;
    table_key key;
    gb_band_table *table; /* allocated on the slot's first build, then reused */
} slot;

#define SLOT_INIT {PTHREAD_RWLOCK_INITIALIZER, false, {GB_BAND_TOTAL, 0, 0, 0, 0}, NULL}

static slot slots[GB_TABLE_CACHE_SLOTS] = {SLOT_INIT, SLOT_INIT, SLOT_INIT, SLOT_INIT,
                                           SLOT_INIT, SLOT_INIT, SLOT_INIT, SLOT_INIT};

static bool same_key(const table_key *a, const table_key *b)
{
    return a->kind == b->kind && a->lower == b->lower && a->upper == b->upper &&
           a->t_min == b->t_min && a->t_max == b->t_max;
}

/* FNV-1a over the key's numbers: which slot a key lives in. */
static unsigned slot_of(const table_key *key)
{
    const double numbers[4] = {key->lower, key->upper, key->t_min, key->t_max};
    unsigned char bytes[sizeof numbers];
    uint32_t hash = 2166136261u ^ (uint32_t)key->kind;
    memcpy(bytes, numbers, sizeof bytes);
    for (size_t i = 0; i < sizeof bytes; i++) {
        hash = (hash ^ bytes[i]) * 16777619u;
    }
    return hash % GB_TABLE_CACHE_SLOTS;
}

/* Under the write lock: make the slot hold the key's table. */
static bool build_into(slot *s, const gb_band *band, const table_key *key)
{
    if (s->valid && same_key(&s->key, key)) {
        return true; /* another request built it while we waited */
    }
    s->valid = false;
    if (s->table == NULL) {
        s->table = malloc(sizeof *s->table);
        if (s->table == NULL) {
            return false;
        }
    }
    if (gb_band_table_build(band, key->t_min, key->t_max, s->table) != GB_OK) {
        return false;
    }
    s->key = *key;
    s->valid = true;
    return true;
}

bool gb_table_cache_acquire(const gb_band *band, double t_min, double t_max,
                            gb_table_lease *lease)
{
    lease->table = NULL;
    if (band == NULL || (band->kind != GB_BAND_WAVELENGTH && band->kind != GB_BAND_WAVENUMBER)) {
        return false;
    }
    table_key key = {band->kind, band->lower, band->upper, t_min, t_max};
    unsigned index = slot_of(&key);
    slot *s = &slots[index];
    /* A few rounds: another key may take the slot between our build and our read. */
    for (int round = 0; round < 3; round++) {
        if (pthread_rwlock_rdlock(&s->lock) != 0) {
            return false;
        }
        if (s->valid && same_key(&s->key, &key)) {
            lease->table = s->table;
            lease->slot = index;
            return true;
        }
        pthread_rwlock_unlock(&s->lock);
        if (pthread_rwlock_wrlock(&s->lock) != 0) {
            return false;
        }
        bool built = build_into(s, band, &key);
        pthread_rwlock_unlock(&s->lock);
        if (!built) {
            return false;
        }
    }
    return false;
}

void gb_table_cache_release(gb_table_lease *lease)
{
    if (lease->table != NULL) {
        pthread_rwlock_unlock(&slots[lease->slot].lock);
        lease->table = NULL;
    }
}
