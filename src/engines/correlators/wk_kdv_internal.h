/* The memo of the KdV route (wk_kdv.c), kept apart from the DVV table's so that the two routes
   share no state; its container is in wk_kdv_memo.c. */
#ifndef PSIKAPPA_WK_KDV_INTERNAL_H
#define PSIKAPPA_WK_KDV_INTERNAL_H

#include <stdatomic.h>
#include <flint/fmpq.h>

#include "wk_kdv.h"

typedef struct {
    ulong hash;
    slong off, n;       /* key = pool[off .. off+n-1] */
} kdv_entry;

struct wk_kdv_table {
    slong limit;                    /* maximum entries, 0 = unlimited */
    atomic_int *cancel;  /* polled before each new entry; not owned */
    slong nest, max_nest;           /* current and deepest recursion nesting */
    slong len, alloc;
    kdv_entry *ent;
    fmpq *val;
    slong *slot, nslots;            /* open addressing, -1 = empty; nslots a power of two >= 2 len */
    slong *pool, pool_len, pool_alloc;
};

/* Index of the entry with this key (h = hash_slongs(key, n)), or -1 when it is absent. */
slong kdv_memo_find(const wk_kdv_table *T, const slong *key, slong n, ulong h);
/* Stores key -> x (copied). WK_LIMIT when the entry limit is reached or memory runs out;
   nothing is stored then. */
int kdv_memo_insert(wk_kdv_table *T, const slong *key, slong n, ulong h, const fmpq_t x);

#endif
