/* theta_msets.c - sub-multisets of a multiset of indices, with their position counts.
 * Both recursions sum over splittings I + J of a set of points; grouping equal indices turns the
 * 2^|S| position subsets into prod (mul_i + 1) sub-multisets weighted by binomials.
 */
#include <stdlib.h>
#include "theta_internal.h"

/* Distinct values and multiplicities of the descending array S; odometer at zero.
   Returns WK_LIMIT if memory runs out (M is then empty and safe to clear). */
int theta_msets_init(theta_msets *M, const slong *S, slong ns)
{
    slong i, p = 0;
    M->p = 0;
    M->val = malloc((size_t) (3 * ns + 3) * sizeof(slong));
    if (M->val == NULL)
        return WK_LIMIT;
    M->mul = M->val + ns + 1;
    M->a = M->mul + ns + 1;
    for (i = 0; i < ns; i++) {
        if (p > 0 && M->val[p - 1] == S[i]) {
            M->mul[p - 1]++;
        } else {
            M->val[p] = S[i];
            M->mul[p] = 1;
            M->a[p] = 0;
            p++;
        }
    }
    M->p = p;
    return WK_OK;
}

/* Frees the arrays of M.
   Safe after a failed init. */
void theta_msets_clear(theta_msets *M)
{
    free(M->val);
    M->val = NULL;
    M->p = 0;
}

/* Next sub-multiset in odometer order.
   Returns 0 after the last one, with every a_i back at 0. */
int theta_msets_next(theta_msets *M)
{
    slong i;
    for (i = 0; i < M->p; i++) {
        if (M->a[i] < M->mul[i]) {
            M->a[i]++;
            return 1;
        }
        M->a[i] = 0;
    }
    return 0;
}

/* out = extra + (I or J), descending.
   The caller provides room for ne + |S| entries. */
slong theta_msets_write(const theta_msets *M, int sel, const slong *extra, slong ne, slong *out)
{
    slong i, c, o = 0, k;
    for (i = 0; i < ne; i++)
        out[o++] = extra[i];
    for (i = 0; i < M->p; i++) {
        k = sel ? M->a[i] : M->mul[i] - M->a[i];
        for (c = 0; c < k; c++)
            out[o++] = M->val[i];
    }
    theta_key_sort(out, o);
    return o;
}

/* c = prod_i C(mul_i, a_i).
   The number of ways to choose the positions of I inside S. */
void theta_msets_count(fmpz_t c, const theta_msets *M)
{
    slong i;
    fmpz_t b;
    fmpz_init(b);
    fmpz_one(c);
    for (i = 0; i < M->p; i++) {
        fmpz_bin_uiui(b, (ulong) M->mul[i], (ulong) M->a[i]);
        fmpz_mul(c, c, b);
    }
    fmpz_clear(b);
}
