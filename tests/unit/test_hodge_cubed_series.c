/* test_hodge_cubed_series.c - Faber's lambda_{g-1}^3 on Mbar_g to genus 30 by a derivation that
 * shares no code with the Hodge routes, and against the operator route where that is quick.
 *
 * The derivation (each step a published formula; the formulas are quoted from memory and the
 * whole chain is confirmed below against the operator route and at g = 2, 3 by hand):
 *
 * 1. Mumford's relation c(E) c(E^dual) = 1 (D. Mumford, "Towards an enumerative geometry of the
 *    moduli space of curves", 1983) in degree 2g-2 gives lambda_{g-1}^2 = 2 lambda_g lambda_{g-2},
 *    so int lambda_{g-1}^3 = 2 int lambda_g lambda_{g-1} lambda_{g-2}.
 * 2. lambda_g lambda_{g-1} restricts to 0 on every boundary divisor of Mbar_g: lambda_g vanishes on
 *    Delta_0, and on Delta_h the restriction contains lambda_h^2 or lambda_{g-h}^2, zero by the
 *    same relation. Mumford's formula writes ch_k(E) (k odd) as B_{k+1}/(k+1)! kappa_k plus
 *    pushforwards from the boundary, so against lambda_g lambda_{g-1} (projection formula) every
 *    ch_k may be replaced by B_{k+1}/(k+1)! kappa_k, also in products. With
 *    c(E) = exp(sum_k (-1)^{k-1} (k-1)! ch_k) this gives
 *        lambda_j lambda_g lambda_{g-1} = [degree j] exp(sum_{k odd} s_k kappa_k) lambda_g lambda_{g-1},
 *        s_k = B_{k+1} / (k (k+1)).
 * 3. Kappa classes as pushforwards (R. Kaufmann, Yu. Manin, D. Zagier, "Higher Weil-Petersson
 *    volumes of moduli spaces of stable n-pointed curves", 1996): with sum_k q_k z^k =
 *    1 - exp(-sum_k s_k z^k),
 *        exp(sum_k s_k kappa_k) = sum_m 1/m! pi_{m*}( prod_{j=1..m} sum_k q_k psi_j^{k+1} ).
 * 4. The lambda_g lambda_{g-1} formula (E. Getzler, R. Pandharipande, "Virasoro constraints and the
 *    Chern classes of the Hodge bundle", 1998; C. Faber, R. Pandharipande, "Hodge integrals and
 *    Gromov-Witten theory", 2000):
 *        int_{Mbar_{g,m}} prod psi_j^{a_j} lambda_g lambda_{g-1}
 *            = (2g-3+m)! |B_{2g}| / (2^{2g-1} (2g)! prod_j (2a_j - 1)!!).
 *    The product over the m points factors, so with Q(w) = sum_k q_k w^k / (2k+1)!!,
 *        int_{Mbar_g} lambda_{g-2} lambda_{g-1} lambda_g
 *            = |B_{2g}| / (2^{2g-1} (2g)!) [w^{g-2}] sum_m (2g-3+m)!/m! Q(w)^m.
 *
 * Checks: twice that against the closed form |B_{2g}|/(2g) |B_{2g-2}|/(2g-2) / (2g-2)!
 * (Faber-Pandharipande 2000, from memory) for g = 2..30 (g = 2: 1/2880, g = 3: 1/725760, both
 * also worked by hand), and int lambda_{g-2} lambda_{g-1} lambda_g by the operator route of the
 * engine for g = 2..8.
 */
#include <flint/arith.h>
#include <flint/fmpz.h>
#include <flint/fmpq.h>
#include <flint/fmpq_poly.h>
#include "hodge/hodge.h"
#include "unit.h"

static unit_report rep;

/* r = r / k for a nonzero word k */
static void fmpq_divide_word(fmpq_t r, slong k)
{
    fmpz_t d;
    fmpz_init_set_si(d, k);
    fmpq_div_fmpz(r, r, d);
    fmpz_clear(d);
}

/* |B_{2k}| / (2k) */
static void bernoulli_over_index(fmpq_t r, slong k)
{
    arith_bernoulli_number(r, (ulong) (2 * k));
    fmpq_abs(r, r);
    fmpq_divide_word(r, 2 * k);
}

/* Q(w) = sum_{k=1..N} q_k w^k / (2k+1)!!, q as in step 3 with s_k = B_{k+1}/(k(k+1)), k odd. */
static void kappa_weight_series(fmpq_poly_t Q, slong N)
{
    fmpq_poly_t s, e;
    fmpq_t c;
    fmpz_t dfac;
    fmpq_poly_init(s);
    fmpq_poly_init(e);
    fmpq_init(c);
    fmpz_init(dfac);
    for (slong k = 1; k <= N; k += 2) {
        arith_bernoulli_number(c, (ulong) (k + 1));
        fmpq_divide_word(c, k * (k + 1));
        fmpq_neg(c, c);
        fmpq_poly_set_coeff_fmpq(s, k, c);   /* -s(z) */
    }
    fmpq_poly_exp_series(e, s, N + 1);
    fmpq_poly_zero(Q);
    for (slong k = 1; k <= N; k++) {
        fmpq_poly_get_coeff_fmpq(c, e, k);
        fmpq_neg(c, c);                      /* q_k = -[z^k] exp(-s) for k >= 1 */
        fmpz_one(dfac);
        for (slong i = 3; i <= 2 * k + 1; i += 2)
            fmpz_mul_si(dfac, dfac, i);
        fmpq_div_fmpz(c, c, dfac);
        fmpq_poly_set_coeff_fmpq(Q, k, c);
    }
    fmpq_poly_clear(s);
    fmpq_poly_clear(e);
    fmpq_clear(c);
    fmpz_clear(dfac);
}

/* res = int_{Mbar_g} lambda_{g-2} lambda_{g-1} lambda_g by steps 2-4 (g >= 2). */
static void triple_by_series(fmpq_t res, slong g)
{
    slong N = g - 2;
    fmpq_poly_t Q, P;
    fmpq_t c, term;
    fmpz_t f;
    fmpq_poly_init(Q);
    fmpq_poly_init(P);
    fmpq_init(c);
    fmpq_init(term);
    fmpz_init(f);
    kappa_weight_series(Q, N);
    fmpq_poly_one(P);                         /* Q^m, truncated above w^N */
    fmpq_zero(res);
    for (slong m = 0; m <= N; m++) {
        fmpq_poly_get_coeff_fmpq(term, P, N);
        fmpz_fac_ui(f, (ulong) (2 * g - 3 + m));
        fmpq_mul_fmpz(term, term, f);
        fmpz_fac_ui(f, (ulong) m);
        fmpq_div_fmpz(term, term, f);
        fmpq_add(res, res, term);
        fmpq_poly_mullow(P, P, Q, N + 1);
    }
    arith_bernoulli_number(c, (ulong) (2 * g));
    fmpq_abs(c, c);
    fmpq_mul(res, res, c);
    fmpz_fac_ui(f, (ulong) (2 * g));
    fmpz_mul_2exp(f, f, (ulong) (2 * g - 1));
    fmpq_div_fmpz(res, res, f);
    fmpq_poly_clear(Q);
    fmpq_poly_clear(P);
    fmpq_clear(c);
    fmpq_clear(term);
    fmpz_clear(f);
}

/* The closed form of int_{Mbar_g} lambda_{g-1}^3 (Faber-Pandharipande 2000, from memory). */
static void cubed_closed(fmpq_t res, slong g)
{
    fmpq_t b;
    fmpz_t f;
    fmpq_init(b);
    fmpz_init(f);
    bernoulli_over_index(res, g);
    bernoulli_over_index(b, g - 1);
    fmpq_mul(res, res, b);
    fmpz_fac_ui(f, (ulong) (2 * g - 2));
    fmpq_div_fmpz(res, res, f);
    fmpq_clear(b);
    fmpz_clear(f);
}

static void test_against_closed_form(slong G)
{
    fmpq_t t, e;
    fmpq_init(t);
    fmpq_init(e);
    for (slong g = 2; g <= G; g++) {
        triple_by_series(t, g);
        fmpq_mul_si(t, t, 2);
        cubed_closed(e, g);
        UNIT_CHECK(&rep, fmpq_equal(t, e), "lambda_{g-1}^3 by Mumford + Getzler-Pandharipande, g=%ld", (long) g);
    }
    fmpq_set_si(e, 1, 2880);
    cubed_closed(t, 2);
    UNIT_CHECK(&rep, fmpq_equal(t, e), "closed form at g=2 is 1/2880");
    fmpq_set_si(e, 1, 725760);
    cubed_closed(t, 3);
    UNIT_CHECK(&rep, fmpq_equal(t, e), "closed form at g=3 is 1/725760");
    printf("lambda_{g-1}^3 by the series against the closed form: g = 2..%ld\n", (long) G);
    fmpq_clear(t);
    fmpq_clear(e);
}

static void test_against_operator(slong G)
{
    wk_table *T = wk_table_new();
    hodge_ctx *H = hodge_new(T);
    fmpq_t v, e;
    fmpq_init(v);
    fmpq_init(e);
    for (slong g = 2; g <= G; g++) {
        slong lm[64] = {0};
        lm[g]++;
        lm[g - 1]++;
        lm[g - 2]++;   /* lambda_0 = 1 at g = 2 */
        int st = hodge_integral_lambda(v, H, HODGE_ROUTE_FP, g, NULL, 0, NULL, 0, lm, g, NULL, 0, 0);
        triple_by_series(e, g);
        UNIT_CHECK(&rep, st == WK_OK && fmpq_equal(v, e),
                   "lambda_{g-2} lambda_{g-1} lambda_g: operator against the series, g=%ld (status %d)", (long) g, st);
    }
    printf("lambda_{g-2} lambda_{g-1} lambda_g, operator against the series: g = 2..%ld\n", (long) G);
    fmpq_clear(v);
    fmpq_clear(e);
    hodge_free(H);
    wk_table_free(T);
}

int main(void)
{
    test_against_closed_form(30);
    test_against_operator(unit_iterations(10) > 11 ? 11 : 10);
    return unit_finish("test_hodge_cubed_series", &rep);
}
