/* hodge.c - the Hodge context, argument checks and dispatch to the two routes. */
#include <stdatomic.h>
#include <math.h>
#include <stdlib.h>
#include <flint/arith.h>
#include <flint/fmpz.h>
#include "hodge_internal.h"

hodge_ctx *hodge_new(wk_table *T)
{
    hodge_ctx *H = calloc(1, sizeof(hodge_ctx));
    if (H == NULL)
        return NULL;
    H->T = T;
    keymap_init(&H->memo[0]);
    keymap_init(&H->memo[1]);
    keymap_init(&H->pair_memo);
    return H;
}

void hodge_free(hodge_ctx *H)
{
    if (H == NULL)
        return;
    keymap_clear(&H->memo[0]);
    keymap_clear(&H->memo[1]);
    hodge_pair_clear(H);
    keymap_clear(&H->pair_memo);
    for (slong l = 0; l < H->nbcoef; l++)
        fmpq_clear(H->bcoef + l);
    free(H->bcoef);
    free(H);
}

void hodge_set_cancel(hodge_ctx *H, atomic_int *flag)
{
    if (H != NULL)
        H->cancel = flag;
}

void hodge_set_pair_full(hodge_ctx *H, int full)
{
    if (H != NULL && H->pair_full != (full != 0)) {
        hodge_pair_clear(H);           /* the memo holds truncated polynomials, or not */
        H->pair_full = full != 0;
    }
}

void hodge_set_limit(hodge_ctx *H, slong max_entries)
{
    if (H != NULL)
        H->limit = max_entries < 0 ? 0 : max_entries;
}

slong hodge_entries(const hodge_ctx *H, int route)
{
    if (H != NULL && route == HODGE_MEMO_PAIR)
        return H->pair_memo.len;
    if (H == NULL || (route != HODGE_ROUTE_GRR && route != HODGE_ROUTE_FP))
        return 0;
    return H->memo[route].len;
}

/* Mumford's coefficients are computed once per l: arith_bernoulli_number is not cheap for
   large l and every recursion step needs one. */
void hodge_coef(fmpq_t c, hodge_ctx *H, slong l)
{
    if (l >= H->nbcoef) {
        slong na = l + 8;
        fmpq *b = realloc(H->bcoef, (size_t) na * sizeof(fmpq));
        if (b == NULL) {
            fmpq_zero(c);
            return;
        }
        H->bcoef = b;
        for (slong i = H->nbcoef; i < na; i++) {
            fmpz_t f;
            fmpq_init(b + i);
            arith_bernoulli_number(b + i, (ulong) (2 * i));
            fmpz_init(f);
            fmpz_fac_ui(f, (ulong) (2 * i));
            fmpq_div_fmpz(b + i, b + i, f);
            fmpz_clear(f);
        }
        H->nbcoef = na;
    }
    fmpq_set(c, H->bcoef + l);
}

int hodge_poll(const hodge_ctx *H, int route)
{
    if (H->cancel != NULL && *H->cancel)
        return WK_CANCELLED;
    if (H->limit > 0 && H->memo[route].len > H->limit)
        return WK_LIMIT;
    return WK_OK;
}

void hodge_sort_desc(slong *d, slong n)
{
    for (slong i = 1; i < n; i++) {
        slong v = d[i], j = i;
        for (; j > 0 && d[j - 1] < v; j--)
            d[j] = d[j - 1];
        d[j] = v;
    }
}

/* WK_OK when every entry of a[from..len-1] lies in 0..HODGE_MAX_INDEX, else WK_BADARG. */
static int hodge_check_range(const slong *a, slong from, slong len)
{
    for (slong i = from; i < len; i++)
        if (a[i] < 0 || a[i] > HODGE_MAX_INDEX)
            return WK_BADARG;
    return WK_OK;
}

int hodge_check_args(const hodge_ctx *H, int route, slong g, const slong *d, slong n,
                     const slong *kmult, slong kmax, const slong *cmult, slong cmax)
{
    if (H == NULL || g < 0 || n < 0 || kmax < 0 || cmax < 0 || (n > 0 && d == NULL)
        || (kmax > 0 && kmult == NULL) || (cmax > 0 && cmult == NULL))
        return WK_BADARG;
    if (route != HODGE_ROUTE_GRR && route != HODGE_ROUTE_FP)
        return WK_BADARG;
    if (g > HODGE_MAX_INDEX || n > HODGE_MAX_INDEX || kmax > HODGE_MAX_INDEX || cmax > HODGE_MAX_INDEX
        || hodge_check_range(d, 0, n) || hodge_check_range(kmult, 1, kmax + 1)
        || hodge_check_range(cmult, 1, cmax + 1))
        return WK_BADARG;
    if (2 * g - 2 + n <= 0)
        return WK_UNSTABLE;
    return WK_OK;
}

/* Checks the arguments (bounds keep keys and recursion depth small), then runs the route. */
int hodge_integral(fmpq_t res, hodge_ctx *H, int route, slong g, const slong *d, slong n,
                   const slong *kmult, slong kmax, const slong *cmult, slong cmax)
{
    return hodge_integral_top(res, H, route, g, d, n, kmult, kmax, cmult, cmax, 0);
}

int hodge_integral_top(fmpq_t res, hodge_ctx *H, int route, slong g, const slong *d, slong n,
                       const slong *kmult, slong kmax, const slong *cmult, slong cmax, int top)
{
    static const slong zeros[1] = {0};
    int st = hodge_check_args(H, route, g, d, n, kmult, kmax, cmult, cmax);
    fmpq_zero(res);
    if (st == WK_OK && top && route != HODGE_ROUTE_FP)
        st = WK_BADARG;
    if (st != WK_OK)
        return st;
    /* the routes read index 0 of every array and copy d with memcpy: never hand them NULL */
    d = n > 0 ? d : zeros;
    kmult = kmax > 0 ? kmult : zeros;
    cmult = cmax > 0 ? cmult : zeros;
    if (route == HODGE_ROUTE_GRR)
        return hodge_grr_integral(res, H, g, d, n, kmult, kmax, cmult, cmax);
    return hodge_fp_integral(res, H, g, d, n, kmult, kmax, cmult, cmax, top);
}
