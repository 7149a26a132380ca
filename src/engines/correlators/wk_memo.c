/* wk_memo.c - the open-addressing hash table behind wk_table (keys are slong arrays). */
#include <stdlib.h>
#include <string.h>
#include "hash.h"
#include "wk_internal.h"

/* Hash of a key of length n (the hash every table of the project uses). */
ulong wk_memo_hash(const slong *key, slong n)
{
    return hash_slongs(key, n);
}

/* Index of the entry with this key, or -1 if absent.
   Linear probing; the table is at most half full, so an empty slot always ends the probe. */
slong wk_memo_find(const wk_table *T, const slong *key, slong n, ulong h)
{
    slong mask = T->nslots - 1;
    slong s = (slong) (h & (ulong) mask);
    while (T->slot[s] >= 0) {
        const wk_entry *e = T->ent + T->slot[s];
        if (e->hash == h && e->n == n
            && memcmp(T->pool + e->off, key, (size_t) n * sizeof(slong)) == 0)
            return T->slot[s];
        s = (s + 1) & mask;
    }
    return -1;
}

/* Doubles the slot array and reinserts every entry.
   Returns WK_OK or WK_LIMIT if memory is exhausted (the table is then unchanged). */
static int wk_memo_grow_slots(wk_table *T)
{
    slong ns = 2 * T->nslots, mask = ns - 1, i;
    slong *slot = malloc((size_t) ns * sizeof(slong));
    if (slot == NULL)
        return WK_LIMIT;
    for (i = 0; i < ns; i++)
        slot[i] = -1;
    for (i = 0; i < T->len; i++) {
        slong s = (slong) (T->ent[i].hash & (ulong) mask);
        while (slot[s] >= 0)
            s = (s + 1) & mask;
        slot[s] = i;
    }
    free(T->slot);
    T->slot = slot;
    T->nslots = ns;
    return WK_OK;
}

/* Makes room for one more entry in ent/val (new fmpz are initialised to zero).
   Returns WK_OK or WK_LIMIT if memory is exhausted; moving fmpz structs by realloc is safe. */
static int wk_memo_reserve_entry(wk_table *T)
{
    slong na, i;
    wk_entry *ent;
    fmpz *val;
    if (T->len < T->alloc)
        return WK_OK;
    na = T->alloc < 64 ? 64 : 2 * T->alloc;
    ent = realloc(T->ent, (size_t) na * sizeof(wk_entry));
    if (ent == NULL)
        return WK_LIMIT;
    T->ent = ent;
    val = realloc(T->val, (size_t) na * sizeof(fmpz));
    if (val == NULL)
        return WK_LIMIT;
    for (i = T->alloc; i < na; i++)
        fmpz_init(val + i);
    T->val = val;
    T->alloc = na;
    return WK_OK;
}

/* Makes room for n more slongs in the key pool.
   Returns WK_OK or WK_LIMIT if memory is exhausted. */
static int wk_memo_reserve_pool(wk_table *T, slong n)
{
    slong na;
    slong *pool;
    if (T->pool_len + n <= T->pool_alloc)
        return WK_OK;
    na = T->pool_alloc < 256 ? 256 : 2 * T->pool_alloc;
    while (na < T->pool_len + n)
        na *= 2;
    pool = realloc(T->pool, (size_t) na * sizeof(slong));
    if (pool == NULL)
        return WK_LIMIT;
    T->pool = pool;
    T->pool_alloc = na;
    return WK_OK;
}

/* Stores key -> x (x is swapped in) and reports the new index in *idx.
   Returns WK_LIMIT when the entry limit is reached or memory runs out; nothing is stored then. */
int wk_memo_insert(wk_table *T, const slong *key, slong n, ulong h, fmpz_t x, slong *idx)
{
    slong mask, s;
    if (T->limit > 0 && T->len >= T->limit)
        return WK_LIMIT;
    if (2 * (T->len + 1) > T->nslots && wk_memo_grow_slots(T) != WK_OK)
        return WK_LIMIT;
    if (wk_memo_reserve_entry(T) != WK_OK || wk_memo_reserve_pool(T, n) != WK_OK)
        return WK_LIMIT;
    if (n > 0)
        memcpy(T->pool + T->pool_len, key, (size_t) n * sizeof(slong));
    T->ent[T->len].hash = h;
    T->ent[T->len].off = T->pool_len;
    T->ent[T->len].n = n;
    fmpz_swap(T->val + T->len, x);
    T->pool_len += n;
    mask = T->nslots - 1;
    s = (slong) (h & (ulong) mask);
    while (T->slot[s] >= 0)
        s = (s + 1) & mask;
    T->slot[s] = T->len;
    *idx = T->len++;
    return WK_OK;
}
