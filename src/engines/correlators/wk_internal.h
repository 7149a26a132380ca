/* wk_internal.h - memo layout shared by wk_memo.c, wk.c and the Theta tables of src/theta (not
 * part of the public API).
 *
 * The memo maps a sorted (descending) multi-index d[0..n-1] to the integer
 *     X(d) = 2^(4g+n-2) * prod_i (2 d_i + 1)!! * <tau_d>_g ,
 * where g is implied by the degree (sum d_i = 3g-3+n).  wk.c explains why X is an integer.
 * Ownership: the table owns its keys and the fmpz values; entry indices stay valid for the
 * table's lifetime, but pointers into pool/val do not (arrays are reallocated when they grow).
 */
#ifndef PSIKAPPA_CORRELATORS_WK_INTERNAL_H
#define PSIKAPPA_CORRELATORS_WK_INTERNAL_H

#include <stdatomic.h>
#include "keyset.h"
#include "wk.h"

struct wk_table {
    slong limit;               /* maximum number of entries, 0 = unlimited */
    atomic_int *cancel;        /* polled before each new entry; not owned */
    keyset keys;               /* the keys (support/keyset.h); entry i is keys index i */
    fmpz *val;                 /* val[i] = X of entry i */
    slong alloc;               /* fmpz allocated (and initialised) in val */
};

/* Hash of a key of length n.
   Pure function; equal keys give equal hashes. */
ulong wk_memo_hash(const slong *key, slong n);

/* Index of the entry with this key (h = wk_memo_hash(key, n)), or -1 if absent.
   Does not modify the table. */
slong wk_memo_find(const wk_table *T, const slong *key, slong n, ulong h);

/* Stores key -> x, taking x's value by swap (x is left holding an unspecified value).
   *idx receives the new entry index. Returns WK_OK, or WK_LIMIT (entry limit or out of memory). */
int wk_memo_insert(wk_table *T, const slong *key, slong n, ulong h, fmpz_t x, slong *idx);

#endif
