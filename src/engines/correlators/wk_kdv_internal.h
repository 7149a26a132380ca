/* The memo of the KdV route (wk_kdv.c), kept apart from the DVV table's so that the two routes
   share no state; its keys are in the container every table shares (support/keyset.h). */
#ifndef PSIKAPPA_WK_KDV_INTERNAL_H
#define PSIKAPPA_WK_KDV_INTERNAL_H

#include <stdatomic.h>
#include <flint/fmpq.h>

#include "keyset.h"
#include "wk_kdv.h"

struct wk_kdv_table {
    slong limit;                    /* maximum entries, 0 = unlimited */
    atomic_int *cancel;             /* polled before each new entry; not owned */
    slong nest, max_nest;           /* current and deepest recursion nesting */
    keyset keys;                    /* the keys (support/keyset.h); entry i is keys index i */
    fmpq *val;                      /* the correlators, val[i] of key i */
    slong alloc;                    /* fmpq allocated (and initialised) in val */
};

/* Index of the entry with this key (h = hash_slongs(key, n)), or -1 when it is absent. */
slong kdv_memo_find(const wk_kdv_table *T, const slong *key, slong n, ulong h);
/* Stores key -> x (copied). WK_LIMIT when the entry limit is reached or memory runs out;
   nothing is stored then. */
int kdv_memo_insert(wk_kdv_table *T, const slong *key, slong n, ulong h, const fmpq_t x);

#endif
