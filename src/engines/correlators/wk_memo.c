/* wk_memo.c - the memo behind wk_table: keys in the shared container (support/keyset.h), the
   integers X in the table's own array. */
#include <stdlib.h>
#include "hash.h"
#include "wk_internal.h"

/* Hash of a key of length n (the hash every table of the project uses). */
ulong wk_memo_hash(const slong *key, slong n)
{
    return hash_slongs(key, n);
}

slong wk_memo_find(const wk_table *T, const slong *key, slong n, ulong h)
{
    return keyset_find(&T->keys, key, n, h);
}

/* Makes room in val for one more entry (new fmpz are initialised to zero); moving fmpz structs
   by realloc is safe. Returns WK_OK or WK_LIMIT if memory is exhausted. */
static int wk_memo_reserve_value(wk_table *T)
{
    if (T->keys.len < T->alloc)
        return WK_OK;
    slong na = T->alloc < 64 ? 64 : 2 * T->alloc;
    fmpz *val = realloc(T->val, (size_t) na * sizeof(fmpz));
    if (val == NULL)
        return WK_LIMIT;
    for (slong i = T->alloc; i < na; i++)
        fmpz_init(val + i);
    T->val = val;
    T->alloc = na;
    return WK_OK;
}

/* Stores key -> x (x is swapped in) and reports the new index in *idx.
   Returns WK_LIMIT when the entry limit is reached or memory runs out; nothing is stored then. */
int wk_memo_insert(wk_table *T, const slong *key, slong n, ulong h, fmpz_t x, slong *idx)
{
    if (T->limit > 0 && T->keys.len >= T->limit)
        return WK_LIMIT;
    if (wk_memo_reserve_value(T) != WK_OK)
        return WK_LIMIT;
    slong i = keyset_add(&T->keys, key, n, h);
    if (i < 0)
        return WK_LIMIT;
    fmpz_swap(T->val + i, x);
    *idx = i;
    return WK_OK;
}
