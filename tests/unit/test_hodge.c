/* test_hodge.c - Hodge integrals (src/engines/hodge/hodge.h): published values and closed formulas on both
 * routes, Mumford's relation as a property test, the lambda-to-ch expansion and every error code.
 *
 * 1. int_{Mbar_{1,1}} lambda_1 = 1/24 and int_{Mbar_2} lambda_1 lambda_2 = 1/5760.
 * 2. The lambda_g formula, the lambda_g lambda_{g-1} formula and lambda_{g-1}^3 on Mbar_g, each
 *    against its closed form evaluated here from Bernoulli numbers.
 * 3. Property test: ch_m written in lambda_1..lambda_g by Newton's identities (lambda_j = 0 for
 *    j > g, E having rank g) integrates to 0 for even m >= 2 (Mumford's relation
 *    c(E) c(E^dual) = 1) and to the direct ch_m integral for odd m, on random integrands;
 *    lambda_g^2 = 0; the lambda_j with j > g expanded into ch classes integrate to 0.
 */
#include <stdatomic.h>
#include <signal.h>
#include <string.h>
#include <flint/arith.h>
#include <flint/fmpz.h>
#include <flint/fmpq_poly.h>
#include <flint/fmpq_vec.h>
#include <flint/fmpq_mpoly.h>
#include <flint/ulong_extras.h>
#include "hodge/hodge.h"
#include "compositions.h"
#include "unit.h"

static unit_report rep;
static const char *route_name[2] = {"GRR", "FP"};

/* Checks res of one integral against e; prints the case on failure. */
static void check_eq(int st, const fmpq_t v, const fmpq_t e, int route, const char *what, slong g,
                     const slong *d, slong n)
{
    int ok = st == WK_OK && fmpq_equal(v, e);
    UNIT_CHECK(&rep, ok, "%s, route %s, g=%ld n=%ld (status %d)", what, route_name[route], (long) g, (long) n, st);
    if (!ok) {
        fprintf(stderr, "    psi =");
        for (slong i = 0; i < n; i++)
            fprintf(stderr, " %ld", (long) d[i]);
        fprintf(stderr, "\n");
        unit_print_fmpq("got", v);
        unit_print_fmpq("expected", e);
    }
}

/* First composition: (0, ..., 0, S). */
static void first_composition(slong *a, slong n, slong S)
{
    for (slong i = 0; i < n; i++)
        a[i] = 0;
    a[n - 1] = S;
}

/* Published single values on both routes. */
static void test_values(hodge_ctx *H)
{
    slong lm[3] = {0, 0, 0}, d[1] = {0};
    fmpq_t v, e;
    fmpq_init(v);
    fmpq_init(e);
    for (int r = 0; r < 2; r++) {
        /* D. Mumford, "Towards an enumerative geometry of the moduli space of curves" (1983),
           from memory: lambda_1 = 1/12 times the class of a point of Mbar_{1,1} (weight 1/2). */
        lm[1] = 1, lm[2] = 0;
        fmpq_set_si(e, 1, 24);
        check_eq(hodge_integral_lambda(v, H, r, 1, d, 1, NULL, 0, lm, 1, NULL, 0, 0), v, e, r,
                 "int_{1,1} lambda_1 = 1/24", 1, d, 1);
        /* the same as ch_1 (lambda_1 = ch_1) */
        slong cm[2] = {0, 1};
        check_eq(hodge_integral(v, H, r, 1, d, 1, NULL, 0, cm, 1), v, e, r, "int_{1,1} ch_1", 1, d, 1);
        /* Mumford 1983, from memory: int_{Mbar_2} lambda_1 lambda_2 = 1/5760 (also the
           lambda_g lambda_{g-1} formula below with n = 0). */
        lm[2] = 1;
        fmpq_set_si(e, 1, 5760);
        check_eq(hodge_integral_lambda(v, H, r, 2, d, 0, NULL, 0, lm, 2, NULL, 0, 0), v, e, r,
                 "int_{2,0} lambda_1 lambda_2 = 1/5760", 2, d, 0);
    }
    fmpq_clear(v);
    fmpq_clear(e);
}

/* b[g] = [t^{2g}] (t/2)/sin(t/2), g = 0..G (b[] initialised by the caller). */
static void lambda_g_series(fmpq *b, slong G)
{
    fmpq_poly_t s, inv;
    fmpz_t f;
    fmpq_t c;
    fmpq_poly_init(s);
    fmpq_poly_init(inv);
    fmpz_init(f);
    fmpq_init(c);
    for (slong k = 0; k <= G; k++) {       /* sin(t/2)/(t/2) = sum (-1)^k (t/2)^{2k} / (2k+1)! */
        fmpz_fac_ui(f, (ulong) (2 * k + 1));
        fmpz_mul_2exp(f, f, (ulong) (2 * k));
        fmpq_set_si(c, k % 2 ? -1 : 1, 1);
        fmpq_div_fmpz(c, c, f);
        fmpq_poly_set_coeff_fmpq(s, 2 * k, c);
    }
    fmpq_poly_inv_series(inv, s, 2 * G + 1);
    for (slong g = 0; g <= G; g++)
        fmpq_poly_get_coeff_fmpq(b + g, inv, 2 * g);
    fmpq_poly_clear(s);
    fmpq_poly_clear(inv);
    fmpz_clear(f);
    fmpq_clear(c);
}

/* The lambda_g formula (C. Faber, R. Pandharipande, "Hodge integrals and Gromov-Witten theory",
   Invent. Math. 139 (2000), Theorem 2 for n = 1; E. Getzler, R. Pandharipande, "Virasoro
   constraints and the Chern classes of the Hodge bundle", Nucl. Phys. B 530 (1998), for n points;
   both from memory): int prod psi_i^{a_i} lambda_g = binom(2g-3+n; a) b_g with
   sum b_g t^{2g} = (t/2)/sin(t/2).  Every composition a, g <= G, N0 <= n <= N. */
static void test_lambda_g(hodge_ctx *H, int route, slong G, slong N0, slong N, int expand)
{
    fmpq *b = _fmpq_vec_init(G + 1);
    slong a[8], lm[64] = {0}, count = 0;
    fmpq_t v, e;
    fmpz_t f;
    fmpq_init(v);
    fmpq_init(e);
    fmpz_init(f);
    lambda_g_series(b, G);
    for (slong g = 1; g <= G; g++)
        for (slong n = N0; n <= N; n++) {
            slong S = 2 * g - 3 + n;
            lm[g] = 1;
            first_composition(a, n, S);
            do {
                fmpz_fac_ui(f, (ulong) S);
                fmpq_mul_fmpz(e, b + g, f);
                for (slong i = 0; i < n; i++) {
                    fmpz_fac_ui(f, (ulong) a[i]);
                    fmpq_div_fmpz(e, e, f);
                }
                check_eq(hodge_integral_lambda(v, H, route, g, a, n, NULL, 0, lm, g, NULL, 0, expand), v, e,
                         route, "lambda_g formula (Faber-Pandharipande 2000, Getzler-Pandharipande 1998)", g, a, n);
                count++;
            } while (next_composition(a, n, S));
            lm[g] = 0;
        }
    printf("lambda_g formula, route %s%s: %ld integrals (g <= %ld, %ld <= n <= %ld)\n", route_name[route],
           route == HODGE_ROUTE_FP && !expand ? " (lambda_g kept whole: its closed form against the series)" : "",
           (long) count, (long) G, (long) N0, (long) N);
    _fmpq_vec_clear(b, G + 1);
    fmpq_clear(v);
    fmpq_clear(e);
    fmpz_clear(f);
}

/* |B_{2g}| as a rational. */
static void abs_bernoulli(fmpq_t b, slong g)
{
    arith_bernoulli_number(b, (ulong) (2 * g));
    fmpq_abs(b, b);
}

/* e = (2g-3+n)! |B_{2g}| / (2^{2g-1} (2g)! prod (2a_i - 1)!!): the lambda_g lambda_{g-1} formula of
   E. Getzler, R. Pandharipande, "Virasoro constraints and the Chern classes of the Hodge bundle",
   Nucl. Phys. B 530 (1998) (from the degree-0 Virasoro conjecture, proved later; from memory).
   For n = 1, a = g-1 it is |B_{2g}| / (2^{2g-1} (2g-1)!! 2g), C. Faber, R. Pandharipande, "Hodge
   integrals and Gromov-Witten theory" (2000), from memory. */
static void lambda_gg1_value(fmpq_t e, slong g, const slong *a, slong n)
{
    fmpz_t f;
    fmpz_init(f);
    abs_bernoulli(e, g);
    fmpz_fac_ui(f, (ulong) (2 * g - 3 + n));
    fmpq_mul_fmpz(e, e, f);
    fmpz_fac_ui(f, (ulong) (2 * g));
    fmpz_mul_2exp(f, f, (ulong) (2 * g - 1));
    fmpq_div_fmpz(e, e, f);
    for (slong i = 0; i < n; i++) {
        fmpz_one(f);
        for (slong k = 2 * a[i] - 1; k > 1; k -= 2)
            fmpz_mul_ui(f, f, (ulong) k);
        fmpq_div_fmpz(e, e, f);
    }
    fmpz_clear(f);
}

/* Every int prod psi^a lambda_g lambda_{g-1} with g <= G, N0 <= n <= N, all a_i >= 1 (the
   formula's range; exponents 0 follow by the string equation), n = 0 only for g = 2, the one
   genus where the degree matches without points. */
static void test_lambda_gg1(hodge_ctx *H, int route, slong G, slong N0, slong N)
{
    slong a[8], lm[64] = {0}, count = 0;
    fmpq_t v, e;
    fmpq_init(v);
    fmpq_init(e);
    for (slong g = 2; g <= G; g++)
        for (slong n = N0; n <= N; n++) {
            slong S = g - 2 + n;
            if (n == 0 && g != 2)
                continue;
            lm[g] = 1, lm[g - 1] = 1;
            if (n > 0)
                first_composition(a, n, S);
            do {
                int has_zero = 0;
                for (slong i = 0; i < n; i++)
                    has_zero |= a[i] == 0;
                if (has_zero)
                    continue;
                lambda_gg1_value(e, g, a, n);
                check_eq(hodge_integral_lambda(v, H, route, g, a, n, NULL, 0, lm, g, NULL, 0, 0), v, e,
                         route, "lambda_g lambda_{g-1} formula (Getzler-Pandharipande 1998)", g, a, n);
                if (n > 0)          /* the engine's closed form (hodge_closed.c) against the same */
                    check_eq(hodge_closed_top_pair(v, g, a, n), v, e, route, "closed form of lambda_g lambda_{g-1}",
                             g, a, n);
                count++;
            } while (n > 0 && next_composition(a, n, S));
            lm[g] = 0, lm[g - 1] = 0;
        }
    printf("lambda_g lambda_{g-1} formula, route %s: %ld integrals (g <= %ld, %ld <= n <= %ld)\n",
           route_name[route], (long) count, (long) G, (long) N0, (long) N);
    fmpq_clear(v);
    fmpq_clear(e);
}

/* int_{Mbar_g} lambda_{g-1}^3 = |B_{2g}|/(2g) |B_{2g-2}|/(2g-2) / (2g-2)! for 2 <= g <= G
   (C. Faber, R. Pandharipande, "Hodge integrals and Gromov-Witten theory", Invent. Math. 139
   (2000), from memory; g = 2 gives 1/2880 = int_{Mbar_2} lambda_1^3). */
static void test_lambda_cubed(hodge_ctx *H, int route, slong G)
{
    slong lm[64] = {0};
    fmpq_t v, e, b;
    fmpz_t f;
    fmpq_init(v);
    fmpq_init(e);
    fmpq_init(b);
    fmpz_init(f);
    for (slong g = 2; g <= G; g++) {
        abs_bernoulli(e, g);
        fmpz_set_si(f, 2 * g);
        fmpq_div_fmpz(e, e, f);
        abs_bernoulli(b, g - 1);
        fmpq_mul(e, e, b);
        fmpz_set_si(f, 2 * g - 2);
        fmpq_div_fmpz(e, e, f);
        fmpz_fac_ui(f, (ulong) (2 * g - 2));
        fmpq_div_fmpz(e, e, f);
        lm[g - 1] = 3;
        check_eq(hodge_integral_lambda(v, H, route, g, NULL, 0, NULL, 0, lm, g - 1, NULL, 0, 0), v, e,
                 route, "lambda_{g-1}^3 (Faber-Pandharipande 2000)", g, NULL, 0);
        check_eq(hodge_closed_lambda_cubed(v, g), v, e, route, "closed form of lambda_{g-1}^3", g, NULL, 0);
        lm[g - 1] = 0;
    }
    printf("lambda_{g-1}^3 on Mbar_g, route %s: g = 2..%ld\n", route_name[route], (long) G);
    fmpq_clear(v);
    fmpq_clear(e);
    fmpq_clear(b);
    fmpz_clear(f);
}

/* The closed forms of hodge_closed.c far beyond the routes (g <= 50): against the formulas as
   evaluated in this file (lambda_gg1_value for every composition with parts >= 1 on n <= 3
   points), the dilaton equation <tau_1 X>_{g,n+1} = (2g-2+n) <X>_{g,n} (a property test), and the
   classification of integrands (hodge_closed_kind) with its refusals. */
static void test_closed_forms(void)
{
    slong a[4], lm[64] = {0}, cm[2] = {0, 1}, km[2] = {0, 1}, count = 0;
    fmpq_t v, w, e;
    fmpq_init(v);
    fmpq_init(w);
    fmpq_init(e);
    for (slong g = 2; g <= 50; g++)
        for (slong n = 1; n <= 3; n++) {
            first_composition(a, n, g - 2 + n);
            do {
                int ok = 1;
                for (slong i = 0; i < n; i++)
                    ok &= a[i] >= 1;
                if (!ok)
                    continue;
                lambda_gg1_value(e, g, a, n);
                check_eq(hodge_closed_top_pair(v, g, a, n), v, e, 1, "closed form to g = 50", g, a, n);
                a[n] = 1;           /* dilaton: one more point with psi^1 */
                hodge_closed_top_pair(w, g, a, n + 1);
                fmpq_mul_si(v, v, 2 * g - 2 + n);
                UNIT_CHECK(&rep, fmpq_equal(v, w), "dilaton equation on the closed form, g=%ld n=%ld (property)",
                           (long) g, (long) n);
                count++;
            } while (next_composition(a, n, g - 2 + n));
        }
    lm[3] = 1, lm[4] = 1, a[0] = 3;
    UNIT_CHECK(&rep, hodge_closed_kind(4, a, 1, NULL, 0, lm, 4, NULL, 0) == HODGE_CLOSED_TOP_PAIR, "kind: top pair");
    UNIT_CHECK(&rep, hodge_closed_kind(4, a, 1, km, 1, lm, 4, NULL, 0) == HODGE_CLOSED_NONE, "kind: with kappa");
    UNIT_CHECK(&rep, hodge_closed_kind(4, a, 1, NULL, 0, lm, 4, cm, 1) == HODGE_CLOSED_NONE, "kind: with ch");
    lm[4] = 0, lm[3] = 3;
    UNIT_CHECK(&rep, hodge_closed_kind(4, a, 0, NULL, 0, lm, 4, NULL, 0) == HODGE_CLOSED_CUBED, "kind: cubed");
    UNIT_CHECK(&rep, hodge_closed_kind(4, a, 1, NULL, 0, lm, 4, NULL, 0) == HODGE_CLOSED_NONE, "kind: cubed, a point");
    a[0] = 0, a[1] = 4;
    UNIT_CHECK(&rep, hodge_closed_top_pair(v, 4, a, 2) == WK_BADARG, "closed form refuses psi^0");
    UNIT_CHECK(&rep, hodge_closed_top_pair(v, 1, a, 1) == WK_BADARG, "closed form refuses g = 1");
    UNIT_CHECK(&rep, hodge_closed_lambda_cubed(v, 1) == WK_BADARG, "lambda_0^3 refused");
    UNIT_CHECK(&rep, hodge_closed_integral(v, 4, a, 2, NULL, 0, lm, 4, NULL, 0) == WK_BADARG && fmpq_is_zero(v),
               "no closed form: WK_BADARG and 0");
    printf("closed form of lambda_g lambda_{g-1} against the formula here and the dilaton equation: %ld integrals (g <= 50, n <= 3)\n",
           (long) count);
    fmpq_clear(v);
    fmpq_clear(w);
    fmpq_clear(e);
}

/* P = m! ch_m as a polynomial in lambda_1..lambda_g (variable j-1 is lambda_j) by Newton's
   identities p_m = sum_{i=1}^{m-1} (-1)^{i-1} e_i p_{m-i} + (-1)^{m-1} m e_m, with e_i = lambda_i
   for i <= g and e_i = 0 above the rank g.  p[] holds p_1..p_m (initialised by the caller). */
static void newton_power_sums(fmpq_mpoly_struct *p, slong m, slong g, const fmpq_mpoly_ctx_t R)
{
    fmpq_mpoly_t t;
    fmpq_mpoly_init(t, R);
    for (slong k = 1; k <= m; k++) {
        fmpq_mpoly_zero(p + k, R);
        for (slong i = 1; i < k && i <= g; i++) {
            fmpq_mpoly_gen(t, i - 1, R);
            fmpq_mpoly_mul(t, t, p + k - i, R);
            (i % 2 ? fmpq_mpoly_add : fmpq_mpoly_sub)(p + k, p + k, t, R);
        }
        if (k <= g) {
            fmpq_mpoly_gen(t, k - 1, R);
            fmpq_mpoly_scalar_mul_si(t, t, k % 2 ? k : -k, R);
            fmpq_mpoly_add(p + k, p + k, t, R);
        }
    }
    fmpq_mpoly_clear(t, R);
}

/* res = int X * P(lambda) where X = psi^d kappa^km, P a polynomial in lambda_1..lambda_g. */
static int integrate_lambda_poly(fmpq_t res, hodge_ctx *H, int route, slong g, const slong *d, slong n,
                                 const slong *km, slong kmax, const fmpq_mpoly_t P, const fmpq_mpoly_ctx_t R)
{
    slong e[8];
    fmpq_t c, v;
    int st = WK_OK;
    fmpq_init(c);
    fmpq_init(v);
    fmpq_zero(res);
    for (slong t = 0; t < fmpq_mpoly_length(P, R) && st == WK_OK; t++) {
        slong lm[9] = {0};
        fmpq_mpoly_get_term_exp_si(e, P, t, R);
        fmpq_mpoly_get_term_coeff_fmpq(c, P, t, R);
        for (slong j = 1; j <= g; j++)
            lm[j] = e[j - 1];
        st = hodge_integral_lambda(v, H, route, g, d, n, km, kmax, lm, g, NULL, 0, 0);
        fmpq_mul(v, v, c);
        fmpq_add(res, res, v);
    }
    fmpq_clear(c);
    fmpq_clear(v);
    return st;
}

/* A random psi-kappa monomial of degree S on n points (kappa indices <= 3). */
static void random_psi_kappa(flint_rand_t st, slong *d, slong n, slong *km, slong S)
{
    memset(km, 0, 4 * sizeof(slong));
    for (slong i = 0; i < n; i++)
        d[i] = 0;
    while (S > 0) {
        slong j = 1 + (slong) n_randint(st, (ulong) (S < 3 ? S : 3));
        if (n > 0 && n_randint(st, 2)) {
            d[n_randint(st, (ulong) n)]++;
            S--;
        } else {
            km[j]++;
            S -= j;
        }
    }
}

/* int X ch_m with ch_m in lambda_1..lambda_g (Newton) against 0 (m even) or the direct int X ch_m
   (m odd), X random of degree D - m.  Returns 1 when they agree. */
static int check_newton(hodge_ctx *H, flint_rand_t st, int route, slong g, slong n, slong m)
{
    slong D = 3 * g - 3 + n, d[4], km[4], cm[16] = {0};
    fmpq_mpoly_ctx_t R;
    fmpq_mpoly_struct p[16];
    fmpq_t v, w;
    fmpz_t f;
    fmpq_init(v);
    fmpq_init(w);
    fmpz_init(f);
    fmpq_mpoly_ctx_init(R, g, ORD_LEX);
    for (slong k = 0; k <= m; k++)
        fmpq_mpoly_init(p + k, R);
    newton_power_sums(p, m, g, R);
    random_psi_kappa(st, d, n, km, D - m);
    int s1 = integrate_lambda_poly(v, H, route, g, d, n, km, 3, p + m, R), s2 = WK_OK;
    fmpz_fac_ui(f, (ulong) m);
    fmpq_div_fmpz(v, v, f);
    if (m % 2) {
        cm[m] = 1;
        s2 = hodge_integral(w, H, route, g, d, n, km, 3, cm, m);
    }
    int ok = s1 == WK_OK && s2 == WK_OK && fmpq_equal(v, w);
    UNIT_CHECK(&rep, ok, "Newton ch_%ld in lambdas, route %s, g=%ld n=%ld", (long) m, route_name[route],
               (long) g, (long) n);
    for (slong k = 0; k <= m; k++)
        fmpq_mpoly_clear(p + k, R);
    fmpq_mpoly_ctx_clear(R);
    fmpq_clear(v);
    fmpq_clear(w);
    fmpz_clear(f);
    return ok;
}

/* int X lambda_j^e = 0 for random X of degree D - j e (with expand_all: every lambda through the
   ch expansion, no rank shortcut).  Returns 1 when the integral is 0. */
static int check_zero(hodge_ctx *H, flint_rand_t st, int route, slong g, slong n, slong j, slong e)
{
    slong d[4], km[4], lm[16] = {0};
    fmpq_t v;
    fmpq_init(v);
    random_psi_kappa(st, d, n, km, 3 * g - 3 + n - j * e);
    lm[j] = e;
    int s1 = hodge_integral_lambda(v, H, route, g, d, n, km, 3, lm, j, NULL, 0, 1);
    int ok = s1 == WK_OK && fmpq_is_zero(v);
    UNIT_CHECK(&rep, ok, "lambda_%ld^%ld = 0 in genus %ld, route %s", (long) j, (long) e, (long) g,
               route_name[route]);
    fmpq_clear(v);
    return ok;
}

/* Property test (Mumford's relation and the rank of E): for random X, int X ch_m with ch_m
   written in lambda_1..lambda_g is 0 for even m and equals the direct int X ch_m for odd m;
   lambda_g^2 = 0; lambda_j for g < j, expanded into ch classes, integrates to 0. */
static void test_mumford_relation(hodge_ctx *H, flint_rand_t st, int route)
{
    long iters = unit_iterations(60), agree = 0, total = 0;
    for (long it = 0; it < iters; it++) {
        slong g = 1 + (slong) n_randint(st, route == HODGE_ROUTE_FP ? 4 : 3), n = (slong) n_randint(st, 3);
        n = g == 1 && n == 0 ? 1 : n;
        slong D = 3 * g - 3 + n, m = 1 + (slong) n_randint(st, (ulong) (D < 2 * g + 1 ? D : 2 * g + 1));
        slong j = g + 1 + (slong) n_randint(st, 2);
        agree += check_newton(H, st, route, g, n, m), total++;
        if (2 * g <= D)
            agree += check_zero(H, st, route, g, n, g, 2), total++;
        if (j <= D)
            agree += check_zero(H, st, route, g, n, j, 1), total++;
    }
    printf("Mumford's relation, lambda_g^2 = 0 and lambda_{j>g} = 0, route %s: %ld of %ld random integrands agree\n",
           route_name[route], agree, total);
}

/* The ch polynomials of lambda_1..lambda_3 by hand from Newton's identities (hodge_lambda.c):
   lambda_1 = ch_1, lambda_2 = ch_1^2/2, lambda_3 = ch_1^3/6 + 2 ch_3; and lambda_1 lambda_2. */
static void test_lambda_poly(void)
{
    const char *vars[2] = {"a", "b"};          /* a = ch_1, b = ch_3 */
    const char *want[4] = {"a", "1/2*a^2", "1/6*a^3+2*b", "1/2*a^3"};
    slong lm[4][4] = {{0, 1, 0, 0}, {0, 0, 1, 0}, {0, 0, 0, 1}, {0, 1, 1, 0}};
    fmpq_mpoly_ctx_t R;
    fmpq_mpoly_t P, Q;
    fmpq_mpoly_ctx_init(R, 2, ORD_LEX);
    fmpq_mpoly_init(P, R);
    fmpq_mpoly_init(Q, R);
    for (int i = 0; i < 4; i++) {
        int st = hodge_lambda_ch_poly(P, lm[i], 3, R);
        fmpq_mpoly_set_str_pretty(Q, want[i], vars, R);
        UNIT_CHECK(&rep, st == WK_OK && fmpq_mpoly_equal(P, Q, R), "lambda polynomial %d (hand-computed)", i);
    }
    lm[0][1] = -1;
    UNIT_CHECK(&rep, hodge_lambda_ch_poly(P, lm[0], 3, R) == WK_BADARG, "negative lambda multiplicity");
    fmpq_mpoly_clear(P, R);
    fmpq_mpoly_clear(Q, R);
    fmpq_mpoly_ctx_clear(R);
}

/* Every error code, and documented conventions at the edges. */
static void test_errors(hodge_ctx *H)
{
    slong d[3] = {0, 0, 0}, bad[3] = {-1, 0, 0}, ibad[2] = {0, -1}, cm[3] = {0, 1, 1}, lm[4] = {0, 0, 0, 1};
    fmpq_t v;
    fmpq_init(v);
    for (int r = 0; r < 2; r++) {
        UNIT_CHECK(&rep, hodge_integral(v, H, r, 1, bad, 1, NULL, 0, NULL, 0) == WK_BADARG, "negative psi");
        UNIT_CHECK(&rep, hodge_integral(v, H, r, 1, d, 1, ibad, 1, NULL, 0) == WK_BADARG, "negative kappa");
        UNIT_CHECK(&rep, hodge_integral(v, H, r, 1, d, 1, NULL, 0, ibad, 1) == WK_BADARG, "negative ch");
        UNIT_CHECK(&rep, hodge_integral(v, H, r, -1, d, 1, NULL, 0, NULL, 0) == WK_BADARG, "negative genus");
        UNIT_CHECK(&rep, hodge_integral(v, H, r, 1, d, 0, NULL, 0, cm, 1) == WK_UNSTABLE, "Mbar_{1,0}");
        UNIT_CHECK(&rep, hodge_integral(v, H, r, 0, d, 2, NULL, 0, NULL, 0) == WK_UNSTABLE, "Mbar_{0,2}");
        UNIT_CHECK(&rep, hodge_integral(v, H, r, 1, d, 1, NULL, 0, cm, HODGE_MAX_INDEX + 1) == WK_BADARG,
                   "ch index too large");
        UNIT_CHECK(&rep, hodge_integral_lambda(v, H, r, 1, d, 1, NULL, 0, ibad, 1, NULL, 0, 0) == WK_BADARG,
                   "negative lambda");
        /* ch_2 = 0 by convention (Mumford): int_{Mbar_{1,2}} ch_2 is 0 with status OK */
        UNIT_CHECK(&rep, hodge_integral(v, H, r, 1, d, 2, NULL, 0, cm, 2) == WK_OK && fmpq_is_zero(v),
                   "ch_1 ch_2 on Mbar_{1,2} is 0");
        /* lambda_3 on Mbar_{1,3}: above the rank, 0 without expansion */
        UNIT_CHECK(&rep, hodge_integral_lambda(v, H, r, 1, d, 3, NULL, 0, lm, 3, NULL, 0, 0) == WK_OK
                   && fmpq_is_zero(v), "lambda_3 in genus 1");
    }
    /* the memo limit and the cancel flag stop a computation, per route */
    wk_table *T = wk_table_new();
    hodge_ctx *L = hodge_new(T);
    atomic_int flag = 1;
    slong lm6[7] = {0, 0, 0, 0, 0, 1, 1}, a[1] = {5};
    hodge_set_limit(L, 10);
    for (int r = 0; r < 2; r++) {
        UNIT_CHECK(&rep, hodge_integral_lambda(v, L, r, 6, a, 1, NULL, 0, lm6, 6, NULL, 0, 0) == WK_LIMIT
                   && fmpq_is_zero(v), "memo limit, route %d", r);
        UNIT_CHECK(&rep, hodge_entries(L, r) <= 11, "memo limit holds, route %d", r);
    }
    hodge_set_limit(L, 0);
    hodge_set_cancel(L, &flag);
    UNIT_CHECK(&rep, hodge_integral_lambda(v, L, 1, 6, a, 1, NULL, 0, lm6, 6, NULL, 0, 0) == WK_CANCELLED,
               "cancel flag");
    hodge_free(L);
    wk_table_free(T);
    UNIT_CHECK(&rep, hodge_integral(v, H, 2, 1, d, 1, NULL, 0, cm, 1) == WK_BADARG, "no route 2");
    UNIT_CHECK(&rep, hodge_integral(v, NULL, 0, 1, d, 1, NULL, 0, cm, 1) == WK_BADARG, "no context");
    fmpq_clear(v);
}

int main(void)
{
    flint_rand_t st;
    wk_table *T = wk_table_new();
    hodge_ctx *H = hodge_new(T);
    flint_randinit(st);
    flint_randseed(st, 20261202, 77);
    test_values(H);
    test_lambda_poly();
    /* expanded into ch classes, the operator route checks the formula; kept whole (as int_{g,n}
       computes it), lambda_g is the formula, whose Bernoulli form is checked against the series */
    test_lambda_g(H, HODGE_ROUTE_FP, 15, 1, 1, 1);
    test_lambda_g(H, HODGE_ROUTE_FP, 7, 2, 3, 1);
    test_lambda_g(H, HODGE_ROUTE_FP, 30, 1, 2, 0);
    test_lambda_g(H, HODGE_ROUTE_GRR, 10, 1, 1, 0);
    test_lambda_g(H, HODGE_ROUTE_GRR, 5, 2, 3, 0);
    /* the operator route keeps lambda_g whole, so lambda_g lambda_{g-1} reaches genus 15 at once and
       lambda_{g-1}^3 (= 2 lambda_{g-2} lambda_{g-1} lambda_g) genus 13, 15 with
       PSIKAPPA_TEST_MULTIPLIER >= 4; Mumford's formula, expanding everything, goes one genus
       further with >= 4 (minutes) and to 12 with >= 16 */
    long mult = unit_iterations(10);
    slong more = mult >= 160 ? 5 : mult >= 40 ? 3 : 0;
    test_lambda_gg1(H, HODGE_ROUTE_FP, 15, 0, 1);      /* lambda_g kept whole: fast */
    test_lambda_gg1(H, HODGE_ROUTE_FP, 6, 2, 3);
    test_lambda_gg1(H, HODGE_ROUTE_GRR, 9 + (more == 5 ? 3 : more > 0), 0, 1);
    test_lambda_gg1(H, HODGE_ROUTE_GRR, 4, 2, 3);
    test_lambda_cubed(H, HODGE_ROUTE_FP, 13 + (more > 0 ? 2 : 0));   /* as 2 lambda_{g-2} lambda_{g-1} lambda_g */
    test_lambda_cubed(H, HODGE_ROUTE_GRR, 8);
    test_mumford_relation(H, st, HODGE_ROUTE_FP);
    test_mumford_relation(H, st, HODGE_ROUTE_GRR);
    test_closed_forms();
    test_errors(H);
    hodge_free(H);
    wk_table_free(T);
    flint_randclear(st);
    flint_cleanup();
    return unit_finish("test_hodge", &rep);
}
