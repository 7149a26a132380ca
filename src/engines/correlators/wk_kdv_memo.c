/* The open-addressing memo of the KdV route: keys are slong arrays in one pool, values fmpq. */
#include <stdlib.h>
#include <string.h>

#include "wk_kdv_internal.h"

/* Index of the entry with this key, or -1 when it is absent.
   The table is at most half full, so an empty slot always ends the probe. */
slong kdv_memo_find(const wk_kdv_table *T, const slong *key, slong n, ulong h)
{
    slong mask = T->nslots - 1, s = (slong) (h & (ulong) mask);
    while (T->slot[s] >= 0) {
        const kdv_entry *e = T->ent + T->slot[s];
        if (e->hash == h && e->n == n && memcmp(T->pool + e->off, key, (size_t) n * sizeof(slong)) == 0)
            return T->slot[s];
        s = (s + 1) & mask;
    }
    return -1;
}

/* Doubles the slot array and reinserts every entry.
   WK_LIMIT when memory is exhausted (the table is then unchanged). */
static int kdv_memo_grow_slots(wk_kdv_table *T)
{
    slong ns = 2 * T->nslots, mask = ns - 1, i, s;
    slong *slot = malloc((size_t) ns * sizeof(slong));
    if (slot == NULL)
        return WK_LIMIT;
    for (i = 0; i < ns; i++)
        slot[i] = -1;
    for (i = 0; i < T->len; i++) {
        for (s = (slong) (T->ent[i].hash & (ulong) mask); slot[s] >= 0; s = (s + 1) & mask)
            ;
        slot[s] = i;
    }
    free(T->slot);
    T->slot = slot;
    T->nslots = ns;
    return WK_OK;
}

/* Makes room for one more entry and n more key slongs (new fmpq are initialised to zero).
   WK_LIMIT when memory is exhausted; moving fmpq structs with realloc is safe. */
static int kdv_memo_reserve(wk_kdv_table *T, slong n)
{
    if (T->len == T->alloc) {
        slong na = T->alloc < 64 ? 64 : 2 * T->alloc, i;
        kdv_entry *ent = realloc(T->ent, (size_t) na * sizeof(kdv_entry));
        fmpq *val;
        if (ent == NULL)
            return WK_LIMIT;
        T->ent = ent;
        val = realloc(T->val, (size_t) na * sizeof(fmpq));
        if (val == NULL)
            return WK_LIMIT;
        for (i = T->alloc; i < na; i++)
            fmpq_init(val + i);
        T->val = val;
        T->alloc = na;
    }
    if (T->pool_len + n > T->pool_alloc) {
        slong na = T->pool_alloc < 256 ? 256 : 2 * T->pool_alloc;
        slong *pool;
        while (na < T->pool_len + n)
            na *= 2;
        pool = realloc(T->pool, (size_t) na * sizeof(slong));
        if (pool == NULL)
            return WK_LIMIT;
        T->pool = pool;
        T->pool_alloc = na;
    }
    return WK_OK;
}

/* Stores key -> x (copied).
   WK_LIMIT when the entry limit is reached or memory runs out; nothing is stored then. */
int kdv_memo_insert(wk_kdv_table *T, const slong *key, slong n, ulong h, const fmpq_t x)
{
    slong mask, s;
    if (T->limit > 0 && T->len >= T->limit)
        return WK_LIMIT;
    if (2 * (T->len + 1) > T->nslots && kdv_memo_grow_slots(T) != WK_OK)
        return WK_LIMIT;
    if (kdv_memo_reserve(T, n) != WK_OK)
        return WK_LIMIT;
    if (n > 0)
        memcpy(T->pool + T->pool_len, key, (size_t) n * sizeof(slong));
    T->ent[T->len].hash = h;
    T->ent[T->len].off = T->pool_len;
    T->ent[T->len].n = n;
    fmpq_set(T->val + T->len, x);
    T->pool_len += n;
    mask = T->nslots - 1;
    for (s = (slong) (h & (ulong) mask); T->slot[s] >= 0; s = (s + 1) & mask)
        ;
    T->slot[s] = T->len++;
    return WK_OK;
}
