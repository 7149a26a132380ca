/* The memo of the KdV route: keys in the shared container, the rationals in the table's array. */
#include <stdlib.h>

#include "wk_kdv_internal.h"

slong kdv_memo_find(const wk_kdv_table *T, const slong *key, slong n, ulong h)
{
    return keyset_find(&T->keys, key, n, h);
}

/* Makes room in val for one more entry (new fmpq are initialised to zero); moving fmpq structs
   with realloc is safe. WK_LIMIT when memory is exhausted. */
static int kdv_memo_reserve_value(wk_kdv_table *T)
{
    if (T->keys.len < T->alloc)
        return WK_OK;
    slong na = T->alloc < 64 ? 64 : 2 * T->alloc;
    fmpq *val = realloc(T->val, (size_t) na * sizeof(fmpq));
    if (val == NULL)
        return WK_LIMIT;
    for (slong i = T->alloc; i < na; i++)
        fmpq_init(val + i);
    T->val = val;
    T->alloc = na;
    return WK_OK;
}

int kdv_memo_insert(wk_kdv_table *T, const slong *key, slong n, ulong h, const fmpq_t x)
{
    if (T->limit > 0 && T->keys.len >= T->limit)
        return WK_LIMIT;
    if (kdv_memo_reserve_value(T) != WK_OK)
        return WK_LIMIT;
    slong i = keyset_add(&T->keys, key, n, h);
    if (i < 0)
        return WK_LIMIT;
    fmpq_set(T->val + i, x);
    return WK_OK;
}
