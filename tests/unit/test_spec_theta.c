/* test_spec_theta.c - unit tests of the specialisation of the Brezin-Gross-Witten free energy
 * F^Theta_g = sum over multisets <Theta | prod tau_k^{m_k}>_g prod t_k^{m_k}/m_k!
 * (spec_plan_build_theta in src/engines/series/spec.h).
 *
 * 1. Random rational times (t_0 without constant term, t_k for k >= 1 with any constant term):
 *    the plan evaluated on the Virasoro table against a direct sum over every multiset (m_0 up to
 *    the order, partitions of g-1 for the rest) with correlators from the KdV table, g <= 6
 *    (two independent enumerations and two independent correlator routes); the fast and generic
 *    evaluation paths against each other.
 * 2. Closed forms of the first free energies (quoted from memory after P. Norbury, "A new
 *    cohomology class on the moduli space of curves", 2017, and N. Do, P. Norbury, "Topological
 *    recursion on the Bessel curve", 2018; confirmed here by the direct sum of part 1):
 *    F^Theta_1 = -1/8 log(1 - t_0) and F^Theta_2 = 3/128 t_1/(1-t_0)^3 at t_0 = x.
 * 3. The plan's count against the number of multisets, and the refusal of a constant t_0.
 */
#include <flint/fmpq_poly.h>
#include "series/spec_internal.h"
#include "series/tseries_internal.h"
#include "theta/theta.h"
#include "unit.h"

#define MAXK 16

static unit_report rep;
static flint_rand_t state;
static fmpq_mpoly_ctx_t ctx;
static theta_table *VT, *KT;

typedef struct {
    fmpq_poly_struct t[MAXK];   /* t_0..t_{MAXK-1} as polynomials in x */
    slong order;
} times;

/* Valuation of t_k (-1 for zero). */
static slong times_valuation(void *data, slong k)
{
    times *S = data;
    slong v = 0;
    if (k >= MAXK || fmpq_poly_is_zero(S->t + k))
        return -1;
    while (fmpz_is_zero(S->t[k].coeffs + v))
        v++;
    return v;
}

/* Random polynomial of degree <= 3 with small coefficients; no constant term when k = 0. */
static void times_random(times *S, slong order)
{
    S->order = order;
    for (slong k = 0; k < MAXK; k++) {
        fmpq_poly_init(S->t + k);
        for (slong e = k == 0 ? 1 : 0; e <= 3; e++)
            if (n_randint(state, 3) != 0)
                fmpq_poly_set_coeff_si(S->t + k, e, (slong) n_randint(state, 7) - 3);
    }
}

static void times_clear(times *S)
{
    for (slong k = 0; k < MAXK; k++)
        fmpq_poly_clear(S->t + k);
}

static int corr_theta(void *data, fmpq_t res, slong g, const slong *d, slong n)
{
    return theta_correlator(res, (theta_table *) data, g, d, n);
}

/* res (fmpq_poly, truncated at order) = F^Theta_g by the plan on table T; fast or generic path. */
static int plan_value(fmpq_poly_t res, slong g, times *S, theta_table *T, int fast, double *terms)
{
    spec_plan *P;
    int st = spec_plan_build_theta(&P, g, S->order, times_valuation, S, 1e7);
    if (st != SPEC_OK)
        return st;
    slong kmax = spec_plan_max_k(P);
    tseries *t = flint_malloc((size_t) (kmax + 2) * sizeof(tseries)), r;
    for (slong k = 0; k <= kmax; k++) {
        tseries_init(t + k, 0, S->order, ctx);
        tseries_set_fmpq_poly(t + k, S->t + k, ctx);
    }
    tseries_init(&r, 0, S->order, ctx);
    st = spec_plan_evaluate_corr_mode(&r, P, corr_theta, T, t, ctx, fast);
    if (st == SPEC_OK)
        tseries_get_fmpq_poly(res, &r, ctx);
    *terms = spec_plan_terms(P);
    tseries_clear(&r, ctx);
    for (slong k = 0; k <= kmax; k++)
        tseries_clear(t + k, ctx);
    flint_free(t);
    spec_plan_free(P);
    return st;
}

/* acc += the multisets with parts k >= kmin of dim left (t_0 already in prod, m points). */
static void direct_rec(fmpq_poly_t acc, slong g, times *S, slong *d, slong n, slong left, slong kmin,
                       const fmpq_poly_t prod, double *count)
{
    if (left == 0) {
        if (2 * g - 2 + n <= 0)
            return;
        fmpq_t c;
        fmpq_poly_t t;
        fmpq_init(c);
        fmpq_poly_init(t);
        theta_correlator(c, KT, g, d, n);
        fmpq_poly_scalar_mul_fmpq(t, prod, c);
        fmpq_poly_add(acc, acc, t);
        *count += 1;
        fmpq_clear(c);
        fmpq_poly_clear(t);
        return;
    }
    for (slong k = kmin; k <= left; k++) {
        fmpq_poly_t p;
        fmpq_poly_init(p);
        fmpq_poly_set(p, prod);
        for (slong m = 1; m * k <= left; m++) {   /* m copies of tau_k: times t_k^m / m! */
            fmpq_poly_mullow(p, p, S->t + k, S->order + 1);
            fmpq_poly_scalar_div_si(p, p, m);
            d[n + m - 1] = k;
            direct_rec(acc, g, S, d, n + m, left - m * k, k + 1, p, count);
        }
        fmpq_poly_clear(p);
    }
}

/* res = F^Theta_g by the direct sum (m_0 = 0..order; t_0 has no constant term). */
static void direct_value(fmpq_poly_t res, slong g, times *S, double *count)
{
    slong d[64];
    fmpq_poly_t p;
    fmpq_poly_init(p);
    fmpq_poly_one(p);
    fmpq_poly_zero(res);
    *count = 0;
    for (slong m0 = 0; m0 <= S->order; m0++) {
        if (m0 > 0) {
            fmpq_poly_mullow(p, p, S->t, S->order + 1);
            fmpq_poly_scalar_div_si(p, p, m0);
            d[m0 - 1] = 0;
        }
        if (!fmpq_poly_is_zero(p) || m0 == 0)
            direct_rec(res, g, S, d, m0, g - 1, 1, p, count);
    }
    fmpq_poly_clear(p);
}

static void test_random(void)
{
    long iters = unit_iterations(40);
    for (long it = 0; it < iters; it++) {
        slong g = 1 + (slong) n_randint(state, 6), order = (slong) n_randint(state, 6);
        times S;
        fmpq_poly_t a, b, c;
        double terms = 0, fast_terms = 0, count = 0;
        times_random(&S, order);
        fmpq_poly_init(a);
        fmpq_poly_init(b);
        fmpq_poly_init(c);
        int st = plan_value(a, g, &S, VT, 1, &fast_terms), st2 = plan_value(b, g, &S, VT, 0, &terms);
        direct_value(c, g, &S, &count);
        UNIT_CHECK(&rep, st == SPEC_OK && st2 == SPEC_OK && fmpq_poly_equal(a, b) && fmpq_poly_equal(a, c),
                   "FTheta_%ld to x^%ld: plan (fast, generic) against the direct sum", (long) g, (long) order);
        /* the direct sum visits multisets whose product vanishes too; the plan prunes by valuation */
        UNIT_CHECK(&rep, terms <= count && terms == fast_terms, "FTheta_%ld plan count %.0f, direct %.0f",
                   (long) g, terms, count);
        fmpq_poly_clear(a);
        fmpq_poly_clear(b);
        fmpq_poly_clear(c);
        times_clear(&S);
    }
    printf("random specialisations: %ld agreed with the direct sum\n", iters);
}

static void test_closed_forms(void)
{
    times S;
    fmpq_poly_t a, e, u;
    double terms;
    slong order = 12;
    times_random(&S, order);
    for (slong k = 0; k < MAXK; k++)
        fmpq_poly_zero(S.t + k);
    fmpq_poly_set_coeff_si(S.t, 1, 1);          /* t_0 = x */
    fmpq_poly_init(a);
    fmpq_poly_init(e);
    fmpq_poly_init(u);
    /* F^Theta_1 = -1/8 log(1 - x) = sum x^j / (8 j) */
    plan_value(a, 1, &S, KT, 1, &terms);
    for (slong j = 1; j <= order; j++) {
        fmpq_t c;
        fmpq_init(c);
        fmpq_set_si(c, 1, 8 * j);
        fmpq_poly_set_coeff_fmpq(e, j, c);
        fmpq_clear(c);
    }
    UNIT_CHECK(&rep, fmpq_poly_equal(a, e), "F^Theta_1 = -1/8 log(1-t_0) (Norbury 2017, from memory)");
    /* F^Theta_2 at t_1 = 1: 3/128 (1-x)^{-3} = 3/128 sum C(j+2,2) x^j */
    fmpq_poly_set_coeff_si(S.t + 1, 0, 1);
    plan_value(a, 2, &S, VT, 1, &terms);
    fmpq_poly_zero(e);
    for (slong j = 0; j <= order; j++) {
        fmpq_t c;
        fmpq_init(c);
        fmpq_set_si(c, 3 * (j + 2) * (j + 1) / 2, 128);
        fmpq_poly_set_coeff_fmpq(e, j, c);
        fmpq_clear(c);
    }
    UNIT_CHECK(&rep, fmpq_poly_equal(a, e),
               "F^Theta_2 = 3/128 t_1/(1-t_0)^3 (Do-Norbury 2018, from memory)");
    /* a constant t_0 is refused */
    spec_plan *P;
    fmpq_poly_set_coeff_si(S.t, 0, 1);
    UNIT_CHECK(&rep, spec_plan_build_theta(&P, 3, 4, times_valuation, &S, 1e7) == SPEC_T0_CONSTANT && P == NULL,
               "constant t_0 refused");
    /* genus 0: Theta vanishes, no multiset */
    fmpq_poly_set_coeff_si(S.t, 0, 0);
    UNIT_CHECK(&rep, plan_value(a, 0, &S, VT, 1, &terms) == SPEC_OK && fmpq_poly_is_zero(a) && terms == 0,
               "F^Theta_0 = 0");
    fmpq_poly_clear(a);
    fmpq_poly_clear(e);
    fmpq_poly_clear(u);
    times_clear(&S);
}

int main(void)
{
    flint_randinit(state);
    fmpq_mpoly_ctx_init(ctx, 1, ORD_LEX);
    VT = theta_table_new(THETA_ROUTE_VIRASORO);
    KT = theta_table_new(THETA_ROUTE_KDV);
    test_random();
    test_closed_forms();
    theta_table_free(VT);
    theta_table_free(KT);
    fmpq_mpoly_ctx_clear(ctx);
    flint_randclear(state);
    flint_cleanup();
    return unit_finish("test_spec_theta", &rep);
}
