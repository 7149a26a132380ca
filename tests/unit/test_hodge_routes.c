/* test_hodge_routes.c - property test: the two Hodge routes of src/engines/hodge/hodge.h (Mumford's
 * Grothendieck-Riemann-Roch reduction with the pushforward at the end, and the operator of
 * Faber-Pandharipande with kappa classes traded for points) agree on random integrands
 * prod psi_i^{d_i} prod kappa_j prod lambda_j prod ch_k on Mbar_{g,n}, g <= 5, n <= 4.
 * Both routes are independent code; they share only the psi correlators of correlators/wk.h.
 * Then integrands holding lambda_g or lambda_{g-1}^2, which the operator route keeps as lambda_g
 * whole (after Mumford's relation lambda_{g-1}^2 = 2 lambda_{g-2} lambda_g), Mumford's route
 * expanding everything.
 * Also: the terms of one step of Mumford's formula (hodge_mumford_terms, what explain prints),
 * each evaluated by the operator route, add up to the integral by the operator route.
 * The count scales with PSIKAPPA_TEST_MULTIPLIER (5000 by default).
 */
#include <string.h>
#include <flint/ulong_extras.h>
#include "hodge/hodge.h"
#include "unit.h"

#define IMAX 8

static unit_report rep;

/* One random integrand: the space, psi exponents and multiplicities of kappa, lambda and ch. */
typedef struct {
    slong g, n, d[4], km[IMAX + 1], lm[IMAX + 1], cm[IMAX + 1];
} integrand;

/* Adds random factors of total degree S to m (index up to IMAX): kind 0 kappa, 1 lambda, 2 ch. */
static void add_factors(flint_rand_t st, slong *m, slong S, slong cap)
{
    while (S > 0) {
        slong top = S < cap ? S : cap, j = 1 + (slong) n_randint(st, (ulong) top);
        m[j]++;
        S -= j;
    }
}

/* Draws a stable space and an integrand of top degree with Hodge degree at least 1. */
static void random_integrand(flint_rand_t st, integrand *I)
{
    slong D, H, K, L;
    memset(I, 0, sizeof(*I));
    do {
        I->g = 1 + (slong) n_randint(st, 5);
        I->n = (slong) n_randint(st, 5);
        D = 3 * I->g - 3 + I->n;
    } while (2 * I->g - 2 + I->n <= 0 || D < 1);
    slong hmax = I->g >= 5 ? 4 : I->g >= 4 ? 5 : 7;
    H = 1 + (slong) n_randint(st, (ulong) (D < hmax ? D : hmax));
    L = (slong) n_randint(st, (ulong) (H + 1));           /* lambda part of the Hodge degree */
    add_factors(st, I->lm, L, I->g + 1);                  /* lambda_{g+1} now and then: 0 */
    add_factors(st, I->cm, H - L, IMAX);
    K = (slong) n_randint(st, (ulong) (D - H + 1));
    if (I->n == 0)
        K = D - H;
    add_factors(st, I->km, K, 3);
    for (slong i = 0; i < D - H - K; i++)
        I->d[n_randint(st, (ulong) I->n)]++;
}

/* Draws an integrand holding lambda_g (top = 1) or lambda_{g-1}^2 (top = 2), the two that the
   operator route keeps whole (lambda_g) instead of expanding, times random factors of the rest of
   the degree. */
static void random_top_integrand(flint_rand_t st, integrand *I, int top)
{
    slong D, R, H, L, K;
    do {
        memset(I, 0, sizeof(*I));
        I->g = (top == 2 ? 2 : 1) + (slong) n_randint(st, top == 2 ? 4 : 5);
        I->n = (slong) n_randint(st, 5);
        D = 3 * I->g - 3 + I->n;
        R = D - (top == 2 ? 2 * I->g - 2 : I->g);
    } while (2 * I->g - 2 + I->n <= 0 || R < 0 || (I->n == 0 && R > 0 && I->g > 4));
    if (top == 2)
        I->lm[I->g - 1] = 2;
    else
        I->lm[I->g] = 1;
    H = (slong) n_randint(st, (ulong) (R < 4 ? R + 1 : 5));
    L = I->g >= 2 ? (slong) n_randint(st, (ulong) (H + 1)) : 0;     /* lambda_j, j < g */
    add_factors(st, I->lm, L, I->g - 1);
    add_factors(st, I->cm, H - L, IMAX);
    K = I->n == 0 ? R - H : (slong) n_randint(st, (ulong) (R - H + 1));
    add_factors(st, I->km, K, 3);
    for (slong i = 0; i < R - H - K; i++)
        I->d[n_randint(st, (ulong) I->n)]++;
}

/* Prints the integrand after a failure. */
static void print_integrand(const integrand *I)
{
    fprintf(stderr, "    g=%ld psi=(", (long) I->g);
    for (slong i = 0; i < I->n; i++)
        fprintf(stderr, i ? ",%ld" : "%ld", (long) I->d[i]);
    fprintf(stderr, ") kappa/lambda/ch multiplicities by index:");
    for (slong j = 1; j <= IMAX; j++)
        fprintf(stderr, " %ld/%ld/%ld", (long) I->km[j], (long) I->lm[j], (long) I->cm[j]);
    fprintf(stderr, "\n");
}

/* Sink of hodge_mumford_terms: acc += w * int A (* int B), both by the operator route. */
typedef struct {
    hodge_ctx *H;
    fmpq_t acc;
    int st;
} term_sum;

static int add_term_fp(void *data, const fmpq_t w, const hodge_mono *A, const hodge_mono *B)
{
    term_sum *T = data;
    fmpq_t a, b;
    fmpq_init(a);
    fmpq_init(b);
    fmpq_one(b);
    int s1 = hodge_integral(a, T->H, HODGE_ROUTE_FP, A->g, A->d, A->n, A->km, A->kmax, A->cm, A->cmax);
    int s2 = B == NULL ? WK_OK : hodge_integral(b, T->H, HODGE_ROUTE_FP, B->g, B->d, B->n, B->km, B->kmax, B->cm, B->cmax);
    if (s1 != WK_OK || s2 != WK_OK)
        T->st = s1 != WK_OK ? s1 : s2;
    fmpq_mul(a, a, b);
    fmpq_addmul(T->acc, a, w);
    fmpq_clear(a);
    fmpq_clear(b);
    return WK_OK;
}

/* The terms of one step of Mumford's formula as explain prints them (hodge_mumford_terms), each
   evaluated by the operator route, times the Bernoulli weight, against the integral itself by
   the operator route: random integrands with ch factors (no lambda), genus 1..5.  Returns the
   number of integrands compared. */
static long test_mumford_terms(flint_rand_t st, hodge_ctx *H, long iters)
{
    long done = 0;
    fmpq_t w, v;
    fmpq_init(w);
    fmpq_init(v);
    for (long it = 0; it < iters; it++) {
        integrand I;
        slong k = 1;
        do
            random_integrand(st, &I);
        while (I.lm[0] + I.lm[1] + I.lm[2] + I.lm[3] + I.lm[4] + I.lm[5] + I.lm[6] + I.lm[7] + I.lm[8] > 0);
        while (k <= IMAX && I.cm[k] == 0)
            k += 2;
        if (k > IMAX)
            continue;                       /* only even ch: nothing to reduce */
        hodge_mono S = {I.g, I.n, IMAX, IMAX, I.d, I.km, I.cm};
        term_sum T;
        T.H = H, T.st = WK_OK;
        fmpq_init(T.acc);
        int s1 = hodge_mumford_terms(w, H, &S, k, add_term_fp, &T);
        int s2 = hodge_integral(v, H, HODGE_ROUTE_FP, I.g, I.d, I.n, I.km, IMAX, I.cm, IMAX);
        fmpq_mul(T.acc, T.acc, w);
        int ok = s1 == WK_OK && s2 == WK_OK && T.st == WK_OK && fmpq_equal(T.acc, v);
        UNIT_CHECK(&rep, ok, "terms of Mumford's formula for ch_%ld vs FP route (status %d, %d, %d)", (long) k, s1,
                   s2, T.st);
        if (!ok)
            print_integrand(&I);
        done++;
        fmpq_clear(T.acc);
    }
    fmpq_clear(w);
    fmpq_clear(v);
    return done;
}

/* Compares the two routes on one integrand; counts agreements and nonzero agreements. */
static void compare_routes(hodge_ctx *H, const integrand *I, const char *what, long *agree, long *nonzero)
{
    fmpq_t a, b;
    fmpq_init(a);
    fmpq_init(b);
    int s1 = hodge_integral_lambda(a, H, HODGE_ROUTE_GRR, I->g, I->d, I->n, I->km, IMAX, I->lm, IMAX, I->cm, IMAX, 0);
    int s2 = hodge_integral_lambda(b, H, HODGE_ROUTE_FP, I->g, I->d, I->n, I->km, IMAX, I->lm, IMAX, I->cm, IMAX, 0);
    int ok = s1 == WK_OK && s2 == WK_OK && fmpq_equal(a, b);
    *agree += ok;
    *nonzero += ok && !fmpq_is_zero(a);
    UNIT_CHECK(&rep, ok, "%s: GRR route vs FP route (status %d, %d)", what, s1, s2);
    if (!ok) {
        print_integrand(I);
        unit_print_fmpq("GRR", a);
        unit_print_fmpq("FP", b);
    }
    fmpq_clear(a);
    fmpq_clear(b);
}

int main(void)
{
    flint_rand_t st;
    wk_table *T = wk_table_new();
    hodge_ctx *H = hodge_new(T);
    long iters = unit_iterations(5000), agree = 0, nonzero = 0;
    flint_randinit(st);
    flint_randseed(st, 20261202, 4242);
    for (long it = 0; it < iters; it++) {
        integrand I;
        random_integrand(st, &I);
        compare_routes(H, &I, "random integrand", &agree, &nonzero);
    }
    printf("GRR route vs FP route: %ld of %ld random integrands agree (%ld nonzero; genus 1..5, <= 4 points)\n",
           agree, iters, nonzero);
    long tops = unit_iterations(2000), top_agree = 0, top_nonzero = 0;
    for (long it = 0; it < tops; it++) {
        integrand I;
        random_top_integrand(st, &I, 1 + (int) (it % 2));
        compare_routes(H, &I, "lambda_g kept whole", &top_agree, &top_nonzero);
    }
    printf("integrands with lambda_g or lambda_{g-1}^2 (the operator keeps lambda_g whole), GRR route vs FP "
           "route: %ld of %ld agree (%ld nonzero)\n", top_agree, tops, top_nonzero);
    UNIT_CHECK(&rep, 2 * top_nonzero > tops, "most lambda_g integrands are nonzero (%ld of %ld)", top_nonzero, tops);
    long terms = test_mumford_terms(st, H, unit_iterations(500));
    printf("one step of Mumford's formula (the terms explain prints) vs FP route: %ld random integrands\n", terms);
    hodge_free(H);
    wk_table_free(T);
    flint_randclear(st);
    flint_cleanup();
    return unit_finish("test_hodge_routes", &rep);
}
