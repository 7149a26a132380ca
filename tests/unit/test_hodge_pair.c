/* test_hodge_pair.c - the generating-polynomial route of src/engines/hodge/hodge_pair.c
 * (int prod psi_i^{d_i} lambda_j lambda_k through P(g, d) = int psi^d Lambda(x) Lambda(y)):
 *
 * 1. Against the operator route (hodge_fp.c) and Mumford's formula (hodge_grr.c), independent code
 *    sharing only the psi correlators: random integrands on Mbar_{g,n}, g <= 5, n <= 4, and every
 *    one-point int_{g,1} psi^a lambda_j lambda_k for g <= 6 against the operator.
 * 2. The lambda_g lambda_{g-1} formula (Getzler-Pandharipande 1998; Faber-Pandharipande 2000;
 *    from memory, in hodge_closed.c) for one point, g <= 9: the closed form against this route.
 * 3. Property tests: with the coefficients above the rank kept (hodge_set_pair_full), those with
 *    an exponent above g integrate to 0 (E has rank g), and lambda_g^2 = 0 (Mumford's relation
 *    c(E) c(E^dual) = 1 in top degree) on random states.
 * The counts scale with PSIKAPPA_TEST_MULTIPLIER.
 */
#include <string.h>
#include <flint/fmpq_poly.h>
#include <flint/ulong_extras.h>
#include "hodge/hodge.h"
#include "unit.h"

static unit_report rep;

/* A random stable (g, n) with g in 1..G, n in 0..N and psi exponents d of total s <= 3g-3+n;
   j, k with j + k = 3g-3+n-s (each possibly above g). */
static void random_case(flint_rand_t st, slong G, slong N, slong *g, slong *n, slong *d, slong *j, slong *k)
{
    slong D, s;
    do {
        *g = 1 + (slong) n_randint(st, (ulong) G);
        *n = (slong) n_randint(st, (ulong) N + 1);
    } while (2 * *g - 2 + *n <= 0);
    D = 3 * *g - 3 + *n;
    s = (slong) n_randint(st, (ulong) D + 1);
    for (slong i = 0; i < *n; i++)
        d[i] = 0;
    for (slong t = 0; t < s && *n > 0; t++)
        d[n_randint(st, (ulong) *n)]++;
    if (*n == 0)
        s = 0;
    *j = (slong) n_randint(st, (ulong) (D - s) + 1);
    *k = D - s - *j;
}

/* The pair route against the route r of hodge_integral_lambda on random integrands. */
static void test_random(hodge_ctx *H, flint_rand_t st, int r, long iters)
{
    long agree = 0, nonzero = 0;
    fmpq_t a, b;
    fmpq_init(a);
    fmpq_init(b);
    for (long it = 0; it < iters; it++) {
        slong g, n, d[4], j, k, lm[32] = {0};
        random_case(st, r == HODGE_ROUTE_GRR ? 4 : 5, 4, &g, &n, d, &j, &k);
        lm[j] += j > 0, lm[k] += k > 0;
        int s1 = hodge_pair_integral(a, H, g, d, n, j, k);
        int s2 = hodge_integral_lambda(b, H, r, g, d, n, NULL, 0, lm, j > k ? j : k, NULL, 0, 0);
        int ok = s1 == WK_OK && s2 == WK_OK && fmpq_equal(a, b);
        agree += ok, nonzero += ok && !fmpq_is_zero(a);
        UNIT_CHECK(&rep, ok, "pair route vs route %d: g=%ld n=%ld lambda_%ld lambda_%ld (status %d, %d)", r, (long) g,
                   (long) n, (long) j, (long) k, s1, s2);
        if (!ok) {
            unit_print_fmpq("pair", a);
            unit_print_fmpq("other", b);
        }
    }
    printf("pair route vs %s: %ld of %ld random integrands agree (%ld nonzero)\n",
           r == HODGE_ROUTE_GRR ? "Mumford's formula" : "the operator", agree, iters, nonzero);
    fmpq_clear(a);
    fmpq_clear(b);
}

/* Every int_{g,1} psi^a lambda_j lambda_k, g <= G, against the operator; and the lambda_g
   lambda_{g-1} closed form (hodge_closed.c, from memory) for g <= G2. */
static void test_one_point(hodge_ctx *H, slong G, slong G2)
{
    long count = 0;
    fmpq_t a, b;
    fmpq_init(a);
    fmpq_init(b);
    for (slong g = 1; g <= G; g++)
        for (slong j = 0; j <= g; j++)
            for (slong k = j; k <= g; k++) {
                slong p = 3 * g - 2 - j - k, lm[32] = {0};
                if (p < 0)
                    continue;
                lm[j] += j > 0, lm[k] += k > 0;
                int s1 = hodge_pair_integral(a, H, g, &p, 1, j, k);
                int s2 = hodge_integral_lambda(b, H, HODGE_ROUTE_FP, g, &p, 1, NULL, 0, lm, g, NULL, 0, 0);
                UNIT_CHECK(&rep, s1 == WK_OK && s2 == WK_OK && fmpq_equal(a, b),
                           "one point, pair vs operator: g=%ld lambda_%ld lambda_%ld", (long) g, (long) j, (long) k);
                count++;
            }
    for (slong g = 2; g <= G2; g++) {
        slong p = g - 1;
        wk_table *T = wk_table_new();
        hodge_ctx *F = hodge_new(T);        /* fresh tables: the caches grow during the recursion */
        int s1 = hodge_pair_integral(a, F, g, &p, 1, g - 1, g);
        hodge_free(F);
        wk_table_free(T);
        int s2 = hodge_closed_top_pair(b, g, &p, 1);
        UNIT_CHECK(&rep, s1 == WK_OK && s2 == WK_OK && fmpq_equal(a, b),
                   "lambda_g lambda_{g-1} psi^{g-1} (Getzler-Pandharipande 1998) by the pair route, g=%ld", (long) g);
    }
    printf("one point: %ld integrals (g <= %ld) agree with the operator; lambda_g lambda_{g-1} closed form to g = %ld\n",
           count, (long) G, (long) G2);
    fmpq_clear(a);
    fmpq_clear(b);
}

/* Property tests on the full polynomials (the recursion then does not know the rank):
   coefficients with an exponent above g vanish, and so does that of x^g y^g (lambda_g^2). */
static void test_properties(flint_rand_t st, long iters)
{
    wk_table *T = wk_table_new();
    hodge_ctx *F = hodge_new(T);
    long checked = 0;
    fmpq_poly_t p;
    fmpq_t c;
    fmpq_poly_init(p);
    fmpq_init(c);
    hodge_set_pair_full(F, 1);
    for (long it = 0; it < iters; it++) {
        slong g, n, d[6], j, k, m;
        random_case(st, 4, 3, &g, &n, d, &j, &k);
        m = j + k;
        int s = hodge_pair_poly(p, F, g, d, n), ok = s == WK_OK;
        for (slong e = 0; e <= m; e++) {
            fmpq_poly_get_coeff_fmpq(c, p, e);
            if (e > g || m - e > g || (e == g && m == 2 * g))
                ok &= fmpq_is_zero(c);
        }
        UNIT_CHECK(&rep, ok, "lambda_{>g} = 0 and lambda_g^2 = 0 in P(g=%ld, n=%ld), degree %ld (property)", (long) g,
                   (long) n, (long) m);
        checked++;
    }
    printf("vanishing above the rank and lambda_g^2 = 0: %ld random states (property)\n", checked);
    fmpq_poly_clear(p);
    fmpq_clear(c);
    hodge_free(F);
    wk_table_free(T);
}

/* Bad arguments, the memo limit and the cancel flag. */
static void test_errors(void)
{
    wk_table *T = wk_table_new();
    hodge_ctx *H = hodge_new(T);
    slong bad[1] = {-1}, a[1] = {5};
    atomic_int flag = 1;
    fmpq_t v;
    fmpq_init(v);
    UNIT_CHECK(&rep, hodge_pair_integral(v, H, 1, bad, 1, 0, 0) == WK_BADARG, "negative psi");
    UNIT_CHECK(&rep, hodge_pair_integral(v, H, 1, a, 1, -1, 0) == WK_BADARG, "negative lambda index");
    UNIT_CHECK(&rep, hodge_pair_integral(v, H, 1, a, 0, 1, 0) == WK_UNSTABLE, "Mbar_{1,0}");
    UNIT_CHECK(&rep, hodge_pair_integral(v, NULL, 1, a, 1, 1, 0) == WK_BADARG, "no context");
    UNIT_CHECK(&rep, hodge_pair_integral(v, H, 1, a, 1, 2, 0) == WK_OK && fmpq_is_zero(v), "wrong degree: 0");
    hodge_set_limit(H, 10);
    UNIT_CHECK(&rep, hodge_pair_integral(v, H, 6, a, 1, 5, 6) == WK_LIMIT && fmpq_is_zero(v), "memo limit");
    UNIT_CHECK(&rep, hodge_entries(H, HODGE_MEMO_PAIR) <= 11, "memo limit holds");
    hodge_set_limit(H, 0);
    hodge_set_cancel(H, &flag);
    a[0] = 6;
    UNIT_CHECK(&rep, hodge_pair_integral(v, H, 6, a, 1, 4, 6) == WK_CANCELLED, "cancel flag");
    fmpq_clear(v);
    hodge_free(H);
    wk_table_free(T);
}

int main(void)
{
    flint_rand_t st;
    wk_table *T = wk_table_new();
    hodge_ctx *H = hodge_new(T);
    flint_randinit(st);
    flint_randseed(st, 20261202, 9191);
    test_random(H, st, HODGE_ROUTE_FP, unit_iterations(400));
    test_random(H, st, HODGE_ROUTE_GRR, unit_iterations(100));
    test_one_point(H, 6, 9);
    test_properties(st, unit_iterations(100));
    test_errors();
    hodge_free(H);
    wk_table_free(T);
    flint_randclear(st);
    flint_cleanup();
    return unit_finish("test_hodge_pair", &rep);
}
