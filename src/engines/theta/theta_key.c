/* theta_key.c - the Theta table, the memoised evaluation of keys and the tau_0 removal.
 *
 * The tau_0 equation.  Let pi: Mbar_{g,n+1} -> Mbar_{g,n} forget the last point.  On Mbar_{g,n+1},
 * psi_i = pi^* psi_i + D_i (D_i: the divisor where points i and n+1 lie alone on a rational tail),
 * and psi_{n+1} D_i = 0 because psi_{n+1} restricts to D_i as the psi class of a point of
 * Mbar_{0,3}.  With Theta_{g,n+1} = psi_{n+1} pi^* Theta_{g,n} (Norbury 2017) this gives
 *     <Theta | tau_0 tau_S>_g = int psi_{n+1} pi^*(Theta_{g,n} prod psi_i^{d_i})
 *                              = (2g-2+n) <Theta | tau_S>_g          (|S| = n),
 * since pi_* psi_{n+1} = 2g-2+n.  With <Theta | tau_0>_1 = 1/8 it gives <Theta | tau_0^n>_1 =
 * (n-1)!/8.  X (theta_internal.h) has no factor depending on n, so it obeys the same equation and
 * X(tau_0^n) = (n-1)! in genus 1.  Both routes call theta_eval, so they share only this step.
 */
#include <stdatomic.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>
#include "theta_internal.h"

/* Creates an empty table for one route.
   Returns NULL on a bad route or out of memory; the caller owns the result. */
theta_table *theta_table_new(int route)
{
    theta_table *T;
    if (route != THETA_ROUTE_VIRASORO && route != THETA_ROUTE_KDV)
        return NULL;
    T = calloc(1, sizeof(theta_table));
    if (T == NULL)
        return NULL;
    T->route = route;
    T->memo = wk_table_new();
    if (T->memo == NULL) {
        free(T);
        return NULL;
    }
    return T;
}

/* Releases the table and its memo.
   NULL is accepted. */
void theta_table_free(theta_table *T)
{
    if (T == NULL)
        return;
    wk_table_free(T->memo);
    free(T);
}

/* Entry limit of the memo (0 = unlimited).
   The container enforces it on insertion. */
void theta_table_set_limit(theta_table *T, slong max_entries)
{
    if (T != NULL)
        wk_table_set_limit(T->memo, max_entries);
}

/* Cancel flag polled before each new entry (not owned).
   NULL turns polling off. */
void theta_table_set_cancel(theta_table *T, atomic_int *flag)
{
    if (T != NULL)
        T->cancel = flag;
}

/* Number of memoised zero-free keys.
   0 for NULL. */
slong theta_table_entries(const theta_table *T)
{
    return T == NULL ? 0 : wk_table_entries(T->memo);
}

/* Descending insertion sort.
   Keys have at most g-1 nonzero entries plus a few zeros, so this is cheap. */
void theta_key_sort(slong *key, slong n)
{
    slong i, j, v;
    for (i = 1; i < n; i++) {
        v = key[i];
        for (j = i; j > 0 && key[j - 1] < v; j--)
            key[j] = key[j - 1];
        key[j] = v;
    }
}

/* X of a zero-free key through the memo, computing it by the table's route on a miss.
   The value is copied out because a later insertion may move the memo's arrays. */
static int theta_eval_nonzero(theta_table *T, slong g, const slong *key, slong n, fmpz_t x)
{
    ulong h = wk_memo_hash(key, n);
    slong idx = wk_memo_find(T->memo, key, n, h);
    int st;
    fmpz_t y;
    if (idx >= 0) {
        fmpz_set(x, T->memo->val + idx);
        return WK_OK;
    }
    if (T->cancel && *T->cancel)
        return WK_CANCELLED;
    fmpz_init(y);
    st = T->route == THETA_ROUTE_KDV ? theta_kdv_step(T, g, key, n, y) : theta_vir_step(T, g, key, n, y);
    if (st == WK_OK) {
        fmpz_set(x, y);
        st = wk_memo_insert(T->memo, key, n, h, y, &idx);
    }
    fmpz_clear(y);
    return st;
}

/* x = X(key), key descending with possible zeros at the end.
   Zeros are removed by the tau_0 equation (file comment); the genus is sum(key) + 1. */
int theta_eval(theta_table *T, const slong *key, slong n, fmpz_t x)
{
    slong g = 1, nz = n, i;
    int st;
    for (i = 0; i < n; i++)
        g += key[i];
    while (nz > 0 && key[nz - 1] == 0)
        nz--;
    if (nz == 0) {                   /* genus 1: X(tau_0^n) = (n-1)!, no stable space for n = 0 */
        if (n == 0)
            fmpz_zero(x);
        else
            fmpz_fac_ui(x, (ulong) (n - 1));
        return WK_OK;
    }
    st = theta_eval_nonzero(T, g, key, nz, x);
    for (i = nz; st == WK_OK && i < n; i++)
        fmpz_mul_ui(x, x, (ulong) (2 * g - 2 + i));
    return st;
}

/* Argument checks in the documented order (BADARG, UNSTABLE, LIMIT).
   Returns WK_OK when the number may be computed. */
static int theta_check_args(const theta_table *T, slong g, const slong *d, slong n)
{
    int st = wk_check_space(T == NULL, g, d, n);
    if (st != WK_OK)
        return st;
    if (g > THETA_MAX_GENUS || n > 4 * THETA_MAX_GENUS)
        return WK_LIMIT;
    return WK_OK;
}

/* res = X / (2^(4g-1) prod (2d_i+1)!!), undoing the normalisation of theta_internal.h.
   d holds the indices in any order. */
static void theta_x_to_fmpq(fmpq_t res, const fmpz_t X, slong g, const slong *d, slong n)
{
    slong i, j;
    fmpz_t den;
    fmpz_init(den);
    fmpz_one(den);
    fmpz_mul_2exp(den, den, (ulong) (4 * g - 1));
    for (i = 0; i < n; i++)
        for (j = 3; j <= 2 * d[i] + 1; j += 2)
            fmpz_mul_ui(den, den, (ulong) j);
    fmpq_set_fmpz_frac(res, X, den);
    fmpz_clear(den);
}

/* res = <Theta | tau_d>_g by the table's route (see theta.h for the status codes).
   A private sorted copy of d is evaluated; degree mismatch (also genus 0) gives 0 at once. */
int theta_correlator(fmpq_t res, theta_table *T, slong g, const slong *d, slong n)
{
    slong i, sum = 0, *key;
    int st;
    fmpz_t x;
    fmpq_zero(res);
    st = theta_check_args(T, g, d, n);
    if (st != WK_OK)
        return st;
    for (i = 0; i < n && sum <= g; i++)
        sum += d[i] > g ? g + 1 : d[i];
    if (g == 0 || sum != g - 1)
        return WK_OK;
    key = malloc((size_t) (n + 1) * sizeof(slong));
    if (key == NULL)
        return WK_LIMIT;
    for (i = 0; i < n; i++)
        key[i] = d[i];
    theta_key_sort(key, n);
    fmpz_init(x);
    st = theta_eval(T, key, n, x);
    if (st == WK_OK)
        theta_x_to_fmpq(res, x, g, key, n);
    fmpz_clear(x);
    free(key);
    return st;
}

/* Partitions of 0..g-1 (the zero-free keys of genus <= g), by Euler's recurrence in doubles.
   HUGE_VAL above 1e18; 0 for g < 1. */
double theta_estimate_entries(slong g)
{
    double *p, tot = 0.0;
    slong i, k;
    if (g < 1)
        return 0.0;
    if (g > 2000)
        return HUGE_VAL;
    p = calloc((size_t) g + 1, sizeof(double));
    if (p == NULL)
        return HUGE_VAL;
    p[0] = 1.0;
    for (k = 1; k < g; k++)           /* parts of size k, coin-change style */
        for (i = k; i < g; i++)
            p[i] += p[i - k];
    for (i = 0; i < g; i++)
        tot += p[i];
    free(p);
    return tot > 1e18 ? HUGE_VAL : tot;
}
