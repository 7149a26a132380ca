#include "keyset.h"

#include <stdlib.h>
#include <string.h>

int keyset_init(keyset *K)
{
    memset(K, 0, sizeof *K);
    K->slot = malloc(64 * sizeof(keyset_slot));
    if (K->slot == NULL)
        return 0;
    K->nslots = 64;
    for (slong i = 0; i < K->nslots; i++)
        K->slot[i].idx = -1;
    return 1;
}

void keyset_clear(keyset *K)
{
    free(K->ent);
    free(K->slot);
    free(K->pool);
    memset(K, 0, sizeof *K);
}

/* The keys are a few words long: a loop is cheaper than a call to memcmp. */
static int keyset_equal(const slong *a, const slong *b, slong n)
{
    for (slong i = 0; i < n; i++)
        if (a[i] != b[i])
            return 0;
    return 1;
}

/* Linear probing; the table is at most half full, so an empty slot always ends the probe. */
slong keyset_find(const keyset *K, const slong *key, slong n, ulong h)
{
    slong mask = K->nslots - 1, s = (slong)(h & (ulong)mask);
    while (K->slot[s].idx >= 0) {
        if (K->slot[s].hash == h) {
            const keyset_entry *e = K->ent + K->slot[s].idx;
            if (e->n == n && keyset_equal(K->pool + e->off, key, n))
                return K->slot[s].idx;
        }
        s = (s + 1) & mask;
    }
    return -1;
}

/* Places entry i (e) in the first free slot of its probe sequence. */
static void keyset_place(keyset_slot *slot, slong nslots, const keyset_entry *e, slong i)
{
    slong mask = nslots - 1, s = (slong)(e->hash & (ulong)mask);
    while (slot[s].idx >= 0)
        s = (s + 1) & mask;
    slot[s] = (keyset_slot){e->hash, i};
}

/* Doubles the slot array and reinserts every entry; 0 when memory is exhausted (unchanged). */
static int keyset_grow_slots(keyset *K)
{
    slong ns = 2 * K->nslots;
    keyset_slot *slot = malloc((size_t)ns * sizeof(keyset_slot));
    if (slot == NULL)
        return 0;
    for (slong i = 0; i < ns; i++)
        slot[i].idx = -1;
    for (slong i = 0; i < K->len; i++)
        keyset_place(slot, ns, K->ent + i, i);
    free(K->slot);
    K->slot = slot;
    K->nslots = ns;
    return 1;
}

/* Room for one more entry and n more pool slongs; 0 when memory is exhausted. */
static int keyset_reserve(keyset *K, slong n)
{
    if (K->len == K->alloc) {
        slong na = K->alloc < 64 ? 64 : 2 * K->alloc;
        keyset_entry *ent = realloc(K->ent, (size_t)na * sizeof(keyset_entry));
        if (ent == NULL)
            return 0;
        K->ent = ent;
        K->alloc = na;
    }
    if (K->pool_len + n > K->pool_alloc) {
        slong na = K->pool_alloc < 256 ? 256 : 2 * K->pool_alloc;
        while (na < K->pool_len + n)
            na *= 2;
        slong *pool = realloc(K->pool, (size_t)na * sizeof(slong));
        if (pool == NULL)
            return 0;
        K->pool = pool;
        K->pool_alloc = na;
    }
    return 1;
}

slong keyset_add(keyset *K, const slong *key, slong n, ulong h)
{
    if (2 * (K->len + 1) > K->nslots && !keyset_grow_slots(K))
        return -1;
    if (!keyset_reserve(K, n))
        return -1;
    if (n > 0)
        memcpy(K->pool + K->pool_len, key, (size_t)n * sizeof(slong));
    K->ent[K->len] = (keyset_entry){h, K->pool_len, n};
    K->pool_len += n;
    keyset_place(K->slot, K->nslots, K->ent + K->len, K->len);
    return K->len++;
}
