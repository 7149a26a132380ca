/* wk_closed.c - correlators that need no table: degree mismatch, one point, two points
 * (wk_twopoint.c), genus zero, and whatever the string and dilaton equations reduce to those.
 *
 * One point: <tau_{3g-2}>_g = 1/(24^g g!) (E. Witten, "Two-dimensional gravity and intersection
 * theory on moduli space", 1991, from memory).  It also follows from the KdV step of wk_kdv.c with
 * M empty: 6g <tau_{3g-2}>_g = 1/4 <tau_{3g-1} tau_0^4>_{g-1} = 1/4 <tau_{3g-5}>_{g-1} (string
 * equation four times), and <tau_1>_1 = 1/24.
 * Genus zero: <tau_{d_1} ... tau_{d_n}>_0 = (n-3)! / prod d_i! (Witten 1991).  Proof by the string
 * equation: sum d_i = n-3 < n, so some d_i = 0, and removing it gives
 * sum_j (n-4)! d_j / prod d_i! = (n-4)! (n-3) / prod d_i!, with <tau_0^3>_0 = 1.
 */
#include <stdlib.h>
#include <string.h>
#include <flint/fmpz.h>
#include "wk.h"

int wk_check_space(int table_missing, slong g, const slong *d, slong n)
{
    if (table_missing || g < 0 || n < 0 || (n > 0 && d == NULL))
        return WK_BADARG;
    for (slong i = 0; i < n; i++)
        if (d[i] < 0)
            return WK_BADARG;
    if ((g == 0 && n <= 2) || (g == 1 && n == 0))
        return WK_UNSTABLE;
    return WK_OK;
}

/* Whether sum d_i = 3g-3+n, for 0 <= g, n <= WORD_MAX / 8 and d_i >= 0.
   Stops once the target is passed, so huge d_i cannot overflow. */
int wk_degree_matches(slong g, const slong *d, slong n)
{
    slong i, D = 3 * g - 3 + n, sum = 0;
    for (i = 0; i < n; i++) {
        if (d[i] > D - sum)
            return 0;
        sum += d[i];
    }
    return sum == D;
}

/* res = 1/(24^g g!).
   g >= 1 and bounded by the caller. */
static void wk_closed_set_one_point(fmpq_t res, slong g)
{
    fmpz_t f;
    fmpz_init(f);
    fmpz_one(fmpq_numref(res));
    fmpz_set_ui(fmpq_denref(res), 24);
    fmpz_pow_ui(fmpq_denref(res), fmpq_denref(res), (ulong) g);
    fmpz_fac_ui(f, (ulong) g);
    fmpz_mul(fmpq_denref(res), fmpq_denref(res), f);
    fmpz_clear(f);
}

/* res = (n-3)! / prod d_i! (already in lowest terms after canonicalisation).
   n >= 3 and sum d_i = n-3. */
static void wk_closed_set_genus0(fmpq_t res, const slong *d, slong n)
{
    slong i;
    fmpz_t f;
    fmpz_init(f);
    fmpz_fac_ui(fmpq_numref(res), (ulong) (n - 3));
    fmpz_one(fmpq_denref(res));
    for (i = 0; i < n; i++)
        if (d[i] > 1) {
            fmpz_fac_ui(f, (ulong) d[i]);
            fmpz_mul(fmpq_denref(res), fmpq_denref(res), f);
        }
    fmpq_canonicalise(res);
    fmpz_clear(f);
}

/* Whether a formula applies to <tau_d>_g directly (degree already matching, input valid):
   one point, genus zero, or two points within WK_TWO_POINT_MAX_G. */
static int wk_closed_is_base(slong g, slong n)
{
    if (3 * g - 3 + n > WK_CLOSED_MAX_DIM)
        return 0;
    return n == 1 || g == 0 || (n == 2 && g <= WK_TWO_POINT_MAX_G);
}

/* res = the base formula (wk_closed_is_base holds).  Returns the steps it is charged: the
   two-point form costs about g^2/6 big-integer steps, one step per 8192 of them. */
static slong wk_closed_base(fmpq_t res, slong g, const slong *d, slong n)
{
    if (n == 1 && res)
        wk_closed_set_one_point(res, g);
    else if (g == 0 && res)
        wk_closed_set_genus0(res, d, n);
    else if (res)
        wk_two_point(res, g, d[0]);
    return n == 2 && g > 0 ? 1 + g * g / 8192 : 1;
}

static int wk_closed_walk(fmpq_t res, slong g, slong *d, slong n, slong *steps);

/* The dilaton equation on the tau_1 at d[n-1]: <tau_1 tau_S>_g = (2g-2+|S|) <tau_S>_g.
   Returns what the walk on tau_S returns. */
static int wk_closed_dilaton(fmpq_t res, slong g, slong *d, slong n, slong *steps)
{
    int ok = wk_closed_walk(res, g, d, n - 1, steps);
    if (ok && res)
        fmpq_mul_si(res, res, 2 * g - 3 + n);
    return ok;
}

/* The string equation on the tau_0 at d[n-1]: <tau_0 tau_S>_g = sum_j <tau_{d_j - 1} tau_{S-j}>_g
   over the j with d_j > 0; d is restored before returning.  Returns 0 when some term has no
   closed form within the step budget. */
static int wk_closed_string(fmpq_t res, slong g, slong *d, slong n, slong *steps)
{
    fmpq_t t;
    int ok = 1;
    fmpq_init(t);
    if (res)
        fmpq_zero(res);
    for (slong j = 0; ok && j < n - 1; j++) {
        if (d[j] == 0 || (j > 0 && d[j] == d[j - 1]))
            continue;            /* equal indices give equal terms: one walk, times the multiplicity */
        slong mult = 1;
        while (j + mult < n - 1 && d[j + mult] == d[j])
            mult++;
        d[j + mult - 1]--;       /* lowering the last copy keeps d sorted */
        ok = wk_closed_walk(res ? t : NULL, g, d, n - 1, steps);
        d[j + mult - 1]++;
        if (ok && res) {
            fmpq_mul_si(t, t, mult);
            fmpq_add(res, res, t);
        }
    }
    fmpq_clear(t);
    return ok;
}

/* res (when not NULL) = <tau_d>_g, d sorted descending (a scratch copy the walk may reorder but
   restores), by the string and dilaton equations down to the base formulas.  Returns 1 when that
   worked within WK_REDUCE_MAX_STEPS steps counted in *steps, else 0. */
static int wk_closed_walk(fmpq_t res, slong g, slong *d, slong n, slong *steps)
{
    if (++*steps > WK_REDUCE_MAX_STEPS)
        return 0;
    if (wk_closed_is_base(g, n)) {
        *steps += wk_closed_base(res, g, d, n) - 1;
        return *steps <= WK_REDUCE_MAX_STEPS;
    }
    if (d[n - 1] > 1)
        return 0;                /* no tau_0 or tau_1: the string and dilaton equations do not apply */
    if (d[n - 1] == 0)
        return wk_closed_string(res, g, d, n, steps);
    return wk_closed_dilaton(res, g, d, n, steps);
}

/* Sorts d descending into a new array for the walk (caller frees); NULL when memory runs out. */
static slong *wk_closed_sorted(const slong *d, slong n)
{
    slong *s = malloc((size_t) (n > 0 ? n : 1) * sizeof(slong));
    if (s == NULL)
        return NULL;
    memcpy(s, d, (size_t) n * sizeof(slong));
    for (slong i = 1; i < n; i++)
        for (slong j = i; j > 0 && s[j - 1] < s[j]; j--) {
            slong t = s[j];
            s[j] = s[j - 1];
            s[j - 1] = t;
        }
    return s;
}

/* Validation, the degree check, then the walk (computing the value when res is not NULL).
   The code as for wk_closed_form. */
static int wk_closed_run(fmpq_t res, slong g, const slong *d, slong n)
{
    slong i, steps = 0;
    if (g < 0 || n < 0 || (n > 0 && d == NULL) || g > WORD_MAX / 8 || n > WORD_MAX / 8)
        return WK_CLOSED_NONE;
    for (i = 0; i < n; i++)
        if (d[i] < 0)
            return WK_CLOSED_NONE;
    if (2 * g - 2 + n <= 0)
        return WK_CLOSED_NONE;
    if (!wk_degree_matches(g, d, n))
        return WK_CLOSED_ZERO;
    if (3 * g - 3 + n > WK_CLOSED_MAX_DIM)
        return WK_CLOSED_NONE;
    slong *s = wk_closed_sorted(d, n);
    int ok = s != NULL && wk_closed_walk(res, g, s, n, &steps);
    free(s);
    return ok ? WK_CLOSED_VALUE : WK_CLOSED_NONE;
}

int wk_closed_form_kind(slong g, const slong *d, slong n)
{
    return wk_closed_run(NULL, g, d, n);
}

/* res = the closed form when one applies (see wk.h).
   res is zero unless the code is WK_CLOSED_VALUE. */
int wk_closed_form(fmpq_t res, slong g, const slong *d, slong n)
{
    int kind = wk_closed_run(res, g, d, n);
    if (kind != WK_CLOSED_VALUE)
        fmpq_zero(res);
    return kind;
}

int wk_correlator(fmpq_t res, wk_table *T, slong g, const slong *d, slong n)
{
    if (wk_closed_form(res, g, d, n) != WK_CLOSED_NONE)
        return WK_OK;
    return wk_table_correlator(res, T, g, d, n);
}
