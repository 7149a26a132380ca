/* wk_closed.c - correlators that need no table: degree mismatch, one point, genus zero.
 *
 * One point: <tau_{3g-2}>_g = 1/(24^g g!) (E. Witten, "Two-dimensional gravity and intersection
 * theory on moduli space", 1991, from memory).  It also follows from the KdV step of wk_kdv.c with
 * M empty: 6g <tau_{3g-2}>_g = 1/4 <tau_{3g-1} tau_0^4>_{g-1} = 1/4 <tau_{3g-5}>_{g-1} (string
 * equation four times), and <tau_1>_1 = 1/24.
 * Genus zero: <tau_{d_1} ... tau_{d_n}>_0 = (n-3)! / prod d_i! (Witten 1991).  Proof by the string
 * equation: sum d_i = n-3 < n, so some d_i = 0, and removing it gives
 * sum_j (n-4)! d_j / prod d_i! = (n-4)! (n-3) / prod d_i!, with <tau_0^3>_0 = 1.
 */
#include <flint/fmpz.h>
#include "wk.h"

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

/* Which closed form applies; see wk.h for the codes.
   Validation mirrors wk_table_correlator, so invalid input is left to it. */
int wk_closed_form_kind(slong g, const slong *d, slong n)
{
    slong i;
    if (g < 0 || n < 0 || (n > 0 && d == NULL) || g > WORD_MAX / 8 || n > WORD_MAX / 8)
        return WK_CLOSED_NONE;
    for (i = 0; i < n; i++)
        if (d[i] < 0)
            return WK_CLOSED_NONE;
    if (2 * g - 2 + n <= 0)
        return WK_CLOSED_NONE;
    if (!wk_degree_matches(g, d, n))
        return WK_CLOSED_ZERO;
    if (3 * g - 3 + n > WK_CLOSED_MAX_DIM || (n != 1 && g != 0))
        return WK_CLOSED_NONE;
    return WK_CLOSED_VALUE;
}

/* res = the closed form when one applies (see wk.h).
   res is zero unless the code is WK_CLOSED_VALUE. */
int wk_closed_form(fmpq_t res, slong g, const slong *d, slong n)
{
    int kind = wk_closed_form_kind(g, d, n);
    fmpq_zero(res);
    if (kind != WK_CLOSED_VALUE)
        return kind;
    if (n == 1)
        wk_closed_set_one_point(res, g);
    else
        wk_closed_set_genus0(res, d, n);
    return WK_CLOSED_VALUE;
}
