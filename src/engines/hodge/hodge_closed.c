/* hodge_closed.c - closed forms for two families of Hodge integrals, without any memo table.
 *
 * 1. E. Getzler, R. Pandharipande, "Virasoro constraints and the Chern classes of the Hodge
 *    bundle", Nucl. Phys. B 530 (1998) (from the degree-0 Virasoro conjecture, proved later), and
 *    for one point C. Faber, R. Pandharipande, "Hodge integrals and Gromov-Witten theory",
 *    Invent. Math. 139 (2000): for g >= 2 and every a_i >= 1 with sum a_i = g - 2 + n,
 *        int_{Mbar_{g,n}} prod psi_i^{a_i} lambda_g lambda_{g-1}
 *            = (2g-3+n)! |B_{2g}| / (2^{2g-1} (2g)! prod_i (2a_i - 1)!!),
 *    for n = 1 (a = g-1): |B_{2g}| / (2^{2g-1} (2g-1)!! 2g).
 * 2. Faber-Pandharipande 2000: int_{Mbar_g} lambda_{g-1}^3 = |B_{2g}| |B_{2g-2}| / (2g (2g-2) (2g-2)!).
 *
 * Both are from memory; tests/unit/test_hodge_closed.c confirms them against the two routes of
 * hodge.h (operator and Mumford's formula) as far as those reach.
 */
#include <flint/arith.h>
#include <flint/fmpz.h>
#include <flint/fmpq.h>
#include "hodge_internal.h"

/* f = (2m - 1)!! (1 for m = 0). */
static void closed_odd_double_factorial(fmpz_t f, slong m)
{
    fmpz_one(f);
    for (slong k = 2 * m - 1; k > 1; k -= 2)
        fmpz_mul_ui(f, f, (ulong) k);
}

int hodge_closed_top_pair(fmpq_t res, slong g, const slong *a, slong n)
{
    slong s = 0;
    fmpz_t f;
    fmpq_zero(res);
    if (g < 2 || g > HODGE_MAX_INDEX || n < 1 || n > HODGE_MAX_INDEX || a == NULL)
        return WK_BADARG;
    for (slong i = 0; i < n; i++) {
        if (a[i] < 1)
            return WK_BADARG;
        s += a[i];
    }
    if (s != g - 2 + n)
        return WK_BADARG;
    fmpz_init(f);
    arith_bernoulli_number(res, (ulong) (2 * g));
    fmpq_abs(res, res);
    fmpz_fac_ui(f, (ulong) (2 * g - 3 + n));
    fmpq_mul_fmpz(res, res, f);
    fmpz_fac_ui(f, (ulong) (2 * g));
    fmpz_mul_2exp(f, f, (ulong) (2 * g - 1));
    fmpq_div_fmpz(res, res, f);
    for (slong i = 0; i < n; i++) {
        closed_odd_double_factorial(f, a[i]);
        fmpq_div_fmpz(res, res, f);
    }
    fmpz_clear(f);
    return WK_OK;
}

int hodge_closed_lambda_cubed(fmpq_t res, slong g)
{
    fmpq_t b;
    fmpz_t f;
    fmpq_zero(res);
    if (g < 2 || g > HODGE_MAX_INDEX)
        return WK_BADARG;
    fmpq_init(b);
    fmpz_init(f);
    arith_bernoulli_number(res, (ulong) (2 * g));
    arith_bernoulli_number(b, (ulong) (2 * g - 2));
    fmpq_mul(res, res, b);
    fmpq_abs(res, res);
    fmpz_fac_ui(f, (ulong) (2 * g - 2));
    fmpz_mul_si(f, f, 2 * g * (2 * g - 2));
    fmpq_div_fmpz(res, res, f);
    fmpq_clear(b);
    fmpz_clear(f);
    return WK_OK;
}

/* Whether m[1..mmax] is zero except for the entries given: m[i1] = c1 and m[i2] = c2 (i2 may
   be 0 for no second entry). */
static int closed_mult_is(const slong *m, slong mmax, slong i1, slong c1, slong i2, slong c2)
{
    for (slong j = 1; j <= mmax; j++) {
        slong want = (j == i1 ? c1 : 0) + (j == i2 ? c2 : 0);
        if (m[j] != want)
            return 0;
    }
    return (i1 <= mmax || c1 == 0) && (i2 == 0 || i2 <= mmax || c2 == 0);
}

int hodge_closed_kind(slong g, const slong *d, slong n, const slong *kmult, slong kmax, const slong *lmult,
                      slong lmax, const slong *cmult, slong cmax)
{
    if (g < 2 || g > HODGE_MAX_INDEX || n < 0 || (n > 0 && d == NULL) || lmult == NULL)
        return HODGE_CLOSED_NONE;
    for (slong j = 1; j <= kmax; j++)
        if (kmult[j] != 0)
            return HODGE_CLOSED_NONE;
    for (slong k = 1; k <= cmax; k++)
        if (cmult[k] != 0)
            return HODGE_CLOSED_NONE;
    if (n == 0 && closed_mult_is(lmult, lmax, g - 1, 3, 0, 0))
        return HODGE_CLOSED_CUBED;
    if (n == 0 || !closed_mult_is(lmult, lmax, g, 1, g - 1, 1))
        return HODGE_CLOSED_NONE;
    slong s = 0;
    for (slong i = 0; i < n; i++) {
        if (d[i] < 1)
            return HODGE_CLOSED_NONE;
        s += d[i];
    }
    return s == g - 2 + n ? HODGE_CLOSED_TOP_PAIR : HODGE_CLOSED_NONE;
}

int hodge_closed_integral(fmpq_t res, slong g, const slong *d, slong n, const slong *kmult, slong kmax,
                          const slong *lmult, slong lmax, const slong *cmult, slong cmax)
{
    switch (hodge_closed_kind(g, d, n, kmult, kmax, lmult, lmax, cmult, cmax)) {
    case HODGE_CLOSED_TOP_PAIR:
        return hodge_closed_top_pair(res, g, d, n);
    case HODGE_CLOSED_CUBED:
        return hodge_closed_lambda_cubed(res, g);
    default:
        fmpq_zero(res);
        return WK_BADARG;
    }
}
