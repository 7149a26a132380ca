/* test_spec.c - unit tests of the specialisation of the Witten-Kontsevich free energy
 * (src/engines/series/spec.h).
 *
 * 1. Weil-Petersson point t_0 = x, t_1 = 0, t_k = (-1)^k/(k-1)! (k >= 2): n! [x^n] F_g must equal
 *    V_{g,n} = int kappa_1^{3g-3+n}/(3g-3+n)! computed independently by pf_integral, for g <= 5,
 *    n <= 12 (property test of the Kaufmann-Manin-Zagier time shift, docs/conventions.md), plus the
 *    Mbar_{0,4} value: [x^4] F_0 = 1/24 (t_1 is not shifted).
 * 2. Genus 0 and 1 closed forms at the WP point (stated from memory, after R. Kaufmann, Yu. Manin,
 *    D. Zagier, "Higher Weil-Petersson volumes of moduli spaces of stable n-pointed curves",
 *    Comm. Math. Phys. 181 (1996), and Yu. Manin, P. Zograf, "Invertible cohomological field
 *    theories and Weil-Petersson volumes", Ann. Inst. Fourier 50 (2000)): with phi_g = F_g at the
 *    WP point, y = phi_0''(x) is the inverse series of x = sum_k (-1)^k y^{k+1}/(k!(k+1)!), and
 *    phi_1 = (1/24) log y'(x) (both checked by hand on the first terms: V_{0,5} = 5/2,
 *    V_{1,2} = 1/16).
 * 3. Higher WP volumes (same KMZ shift, property test): int exp(sum_j s_j kappa_j) prod psi^{d_i}
 *    from the times t_k = x sum_{d_i = k} y_i - p_{k-1}(s) (k >= 2), exp(-sum s_j z^j) =
 *    sum p_k z^k, read off as the coefficient of x^n y_1...y_n, against pf_integral expansions;
 *    with hand-checked examples on Mbar_{0,5} and Mbar_{1,1}.
 * 4. The plan's multiset count against an independent count by integer partitions, the fast
 *    (fmpq_poly) and generic (tseries) evaluation paths against each other, and every error code.
 */
#include <string.h>
#include <flint/fmpq_poly.h>
#include <flint/ulong_extras.h>
#include "correlators/pushforward.h"
#include "series/spec_internal.h"
#include "unit.h"

#define NVARS 128
#define X 0                 /* main variable */
#define NS 3                /* s_1..s_NS at indices 1..NS */
#define ZV 5                /* auxiliary series variable z for p_k(s) */
#define Y0 10               /* y_i at index Y0 + i */
#define MAXN 8

static unit_report rep;
static flint_rand_t state;
static fmpq_mpoly_ctx_t ctx;

/* Times of a test scenario, built on demand by k. */
typedef struct {
    int kind;               /* 0: WP point; 1: KMZ shift with psi labels; 2: custom t_0, t_1 */
    slong order;            /* series order of every time */
    slong n, d[MAXN];       /* kind 1: psi exponents */
    const tseries *p;       /* kind 1: exp(-sum s_j z^j) in z */
    const char *t0, *t1;    /* kind 2: t_0, t_1 as strings in x; t_k (k >= 2) as the WP point
                               when wp_tail, else 0 */
    int wp_tail;
    slong fail_at;          /* the valuation callback fails at this k (-1: never) */
} times;

static const char *names[NVARS];
static char name_buf[NVARS][24];

/* (-1)^k/(k-1)! for k >= 2 (the WP point, docs/conventions.md).
   c must be initialised. */
static void wp_value(fmpq_t c, slong k)
{
    fmpz_fac_ui(fmpq_denref(c), (ulong) (k - 1));
    fmpz_set_si(fmpq_numref(c), k % 2 ? -1 : 1);
}

/* t = x * sum_{i: d_i = k} y_i - [k >= 2] p_{k-1}(s)  (the KMZ-shifted times with psi labels).
   S->p holds exp(-sum s_j z^j) to a sufficient order. */
static void kmz_time(tseries *t, const times *S, slong k)
{
    fmpq_mpoly_t c, g;
    slong i;
    fmpq_mpoly_init(c, ctx), fmpq_mpoly_init(g, ctx);
    for (i = 0; i < S->n; i++)
        if (S->d[i] == k) {
            fmpq_mpoly_gen(g, Y0 + i, ctx);
            fmpq_mpoly_add(c, c, g, ctx);
        }
    fmpq_mpoly_gen(g, X, ctx);
    fmpq_mpoly_mul(c, c, g, ctx);
    if (k >= 2) {
        tseries_coeff(g, S->p, k - 1, ctx);
        fmpq_mpoly_sub(c, c, g, ctx);
    }
    tseries_set_mpoly(t, c, ctx);
    fmpq_mpoly_clear(c, ctx), fmpq_mpoly_clear(g, ctx);
}

/* Builds t_k of scenario S into t (initialised; var and order set here).
   Shared by the valuation callback and the arrays of times. */
static void make_time(tseries *t, const times *S, slong k)
{
    fmpq_t c;
    fmpq_mpoly_t q;
    fmpq_init(c);
    fmpq_mpoly_init(q, ctx);
    t->var = X, t->order = S->order;
    if (S->kind == 1)
        kmz_time(t, S, k);
    else if (k == 0 || k == 1)
        fmpq_mpoly_set_str_pretty(q, S->kind == 2 ? (k == 0 ? S->t0 : S->t1) : (k == 0 ? "x" : "0"),
                                  names, ctx);
    else if (S->kind != 2 || S->wp_tail) {
        wp_value(c, k);
        fmpq_mpoly_set_fmpq(q, c, ctx);
    }
    if (S->kind != 1)
        tseries_set_mpoly(t, q, ctx);
    fmpq_mpoly_clear(q, ctx);
    fmpq_clear(c);
}

/* Valuation callback: builds t_k and returns its valuation (lazily, one k at a time).
   Returns -7 at S->fail_at to test error pass-through. */
static slong times_valuation(void *data, slong k)
{
    const times *S = data;
    tseries t;
    slong v;
    if (k == S->fail_at)
        return -7;
    tseries_init(&t, X, S->order, ctx);
    make_time(&t, S, k);
    v = tseries_valuation(&t, ctx);
    tseries_clear(&t, ctx);
    return v;
}

/* Allocates and fills t[0..kmax] for scenario S (kmax may be -1).
   Release with times_free. */
static tseries *times_array(const times *S, slong kmax)
{
    slong k;
    tseries *t = flint_malloc((size_t) (kmax + 2) * sizeof(tseries));
    for (k = 0; k <= kmax; k++) {
        tseries_init(t + k, X, S->order, ctx);
        make_time(t + k, S, k);
    }
    return t;
}

/* Releases an array from times_array.
   kmax must be the value given to times_array. */
static void times_free(tseries *t, slong kmax)
{
    slong k;
    for (k = 0; k <= kmax; k++)
        tseries_clear(t + k, ctx);
    flint_free(t);
}

/* res = F_g for scenario S to order N (plan, build times, evaluate); returns the status.
   allow_fast selects the evaluation path. */
static int free_energy(tseries *res, slong g, slong N, times *S, wk_table *T, int allow_fast)
{
    spec_plan *P;
    tseries *t;
    int st;
    S->order = N;
    st = spec_plan_build(&P, g, N, times_valuation, S, 1e7);
    if (st != SPEC_OK)
        return st;
    t = times_array(S, spec_plan_max_k(P));
    st = spec_plan_evaluate_mode(res, P, T, t, ctx, allow_fast);
    times_free(t, spec_plan_max_k(P));
    spec_plan_free(P);
    return st;
}

/* 1 when a and b are the same series (var, order, polynomial).
   Used to compare against closed forms. */
static int tseries_equal_check(const tseries *a, const tseries *b)
{
    return a->var == b->var && a->order == b->order && fmpq_mpoly_equal(a->p, b->p, ctx);
}

/* c = coefficient of x^n of s as a rational (0 if it is not a rational constant; flags it).
   Returns 1 when the coefficient is rational. */
static int coeff_q(fmpq_t c, const tseries *s, slong n)
{
    fmpq_mpoly_t p;
    int ok;
    fmpq_mpoly_init(p, ctx);
    tseries_coeff(p, s, n, ctx);
    ok = fmpq_mpoly_is_fmpq(p, ctx);
    if (ok)
        fmpq_mpoly_get_fmpq(c, p, ctx);
    else
        fmpq_zero(c);
    fmpq_mpoly_clear(p, ctx);
    return ok;
}

/* V_{g,n} = int_{Mbar_{g,n}} kappa_1^D / D! by pf_integral (independent of spec); 0 if unstable.
   Returns the pf_integral status. */
static int wp_volume_direct(fmpq_t v, wk_table *T, slong g, slong n)
{
    slong d[64] = {0}, km[2] = {0, 3 * g - 3 + n};
    fmpz_t f;
    int st;
    fmpq_zero(v);
    if (2 * g - 2 + n <= 0)
        return WK_OK;
    st = pf_integral(v, T, g, d, n, km, 1);
    fmpz_init(f);
    fmpz_fac_ui(f, (ulong) km[1]);
    fmpq_div_fmpz(v, v, f);
    fmpz_clear(f);
    return st;
}

/* WP point: n! [x^n] F_g = V_{g,n} for all n <= N (property test of the time shift), including
   the unstable n where both sides are 0. */
static void test_wp_point(slong g, slong N, wk_table *T)
{
    times S = {0};
    tseries F;
    fmpq_t a, b;
    fmpz_t f;
    slong n;
    S.fail_at = -1;
    fmpq_init(a), fmpq_init(b), fmpz_init(f);
    tseries_init(&F, X, N, ctx);
    UNIT_CHECK(&rep, free_energy(&F, g, N, &S, T, 1) == SPEC_OK && F.order == N,
               "WP point F_%ld to x^%ld evaluates", (long) g, (long) N);
    for (n = 0; n <= N; n++) {
        int ok = coeff_q(a, &F, n);
        fmpz_fac_ui(f, (ulong) n);
        fmpq_mul_fmpz(a, a, f);
        UNIT_CHECK(&rep, ok && wp_volume_direct(b, T, g, n) == WK_OK && fmpq_equal(a, b),
                   "property n! [x^n] F_g = V_{g,n} at the WP point, g=%ld n=%ld", (long) g, (long) n);
    }
    tseries_clear(&F, ctx);
    fmpq_clear(a), fmpq_clear(b), fmpz_clear(f);
}

/* Mbar_{0,4}: [x^4] F_0 = <tau_0^4 tau_2>_0 t_2 / 4! = 1/24 (so t_1 is not shifted; the value
   int_{Mbar_{0,4}} kappa_1 = 1 is in docs/conventions.md, Arbarello-Cornalba 1996). */
static void test_m04(wk_table *T)
{
    times S = {0};
    tseries F;
    fmpq_t a, e;
    S.fail_at = -1;
    fmpq_init(a), fmpq_init(e);
    tseries_init(&F, X, 4, ctx);
    fmpq_set_si(e, 1, 24);
    UNIT_CHECK(&rep, free_energy(&F, 0, 4, &S, T, 1) == SPEC_OK && coeff_q(a, &F, 4)
               && fmpq_equal(a, e), "Mbar_{0,4}: [x^4] F_0 = 1/24 at the WP point");
    tseries_clear(&F, ctx);
    fmpq_clear(a), fmpq_clear(e);
}

/* Number of partitions of D (any parts), by the standard DP; independent of the planner.
   D must be below 512. */
static double partitions(slong D)
{
    double p[512] = {1.0};
    slong i, j;
    for (i = 1; i <= D; i++)
        for (j = i; j <= D; j++)
            p[j] += p[j - i];
    return D < 0 ? 0.0 : p[D];
}

/* Plan size at the WP point: sum over m_0 <= N of p(3g-3+m_0) over stable (g, m_0 + parts);
   max_k = 3g-2+N (the term tau_0^N tau_{3g-2+N}). */
static void test_wp_plan_count(slong g, slong N)
{
    times S = {0};
    spec_plan *P;
    double expect = 0.0;
    slong m0;
    S.fail_at = -1;
    S.order = N;
    for (m0 = 0; m0 <= N; m0++)
        if (3 * g - 3 + m0 >= 0)
            expect += partitions(3 * g - 3 + m0) - (g == 1 && m0 == 0);   /* <>_1 is unstable */
    UNIT_CHECK(&rep, spec_plan_build(&P, g, N, times_valuation, &S, 1e9) == SPEC_OK
               && spec_plan_terms(P) == expect && spec_plan_max_k(P) == 3 * g - 2 + N,
               "WP plan size g=%ld N=%ld: %.0f multisets, max_k %ld", (long) g, (long) N, expect,
               (long) (3 * g - 2 + N));
    spec_plan_free(P);
}

/* s = sum_{k>=0} (-1)^k y^{k+1}/(k!(k+1)!) in the main variable (that is sqrt(y) J_1(2 sqrt(y))),
   to the order of s. */
static void bessel_series(tseries *s)
{
    slong k;
    fmpq_t c;
    fmpz_t f;
    fmpq_mpoly_t p, m;
    fmpq_init(c), fmpz_init(f), fmpq_mpoly_init(p, ctx), fmpq_mpoly_init(m, ctx);
    for (k = 0; k + 1 <= s->order; k++) {
        fmpz_fac_ui(fmpq_denref(c), (ulong) k);
        fmpz_fac_ui(f, (ulong) (k + 1));
        fmpz_mul(fmpq_denref(c), fmpq_denref(c), f);
        fmpz_set_si(fmpq_numref(c), k % 2 ? -1 : 1);
        fmpq_mpoly_gen(m, X, ctx);
        fmpq_mpoly_pow_ui(m, m, (ulong) (k + 1), ctx);
        fmpq_mpoly_scalar_mul_fmpq(m, m, c, ctx);
        fmpq_mpoly_add(p, p, m, ctx);
    }
    tseries_set_mpoly(s, p, ctx);
    fmpq_clear(c), fmpz_clear(f), fmpq_mpoly_clear(p, ctx), fmpq_mpoly_clear(m, ctx);
}

/* Genus 0 and 1 at the WP point (formulas from memory, see the file comment):
   phi_0'' = revert(sqrt(y) J_1(2 sqrt(y))) to order N0 - 2, phi_1 = log(y')/24 to order N1. */
static void test_genus01(slong N0, slong N1, wk_table *T)
{
    times S = {0};
    tseries phi, d2, xs, y, dy, lg;
    fmpq_t c;
    S.fail_at = -1;
    fmpq_init(c);
    tseries_init(&phi, X, N0, ctx), tseries_init(&d2, X, 0, ctx), tseries_init(&xs, X, N0 - 2, ctx);
    tseries_init(&y, X, 0, ctx), tseries_init(&dy, X, 0, ctx), tseries_init(&lg, X, 0, ctx);
    UNIT_CHECK(&rep, free_energy(&phi, 0, N0, &S, T, 1) == SPEC_OK, "F_0 at the WP point");
    tseries_derivative(&d2, &phi, X, ctx), tseries_derivative(&d2, &d2, X, ctx);
    bessel_series(&xs);
    UNIT_CHECK(&rep, tseries_revert(&y, &xs, ctx) == TS_OK && d2.order == N0 - 2
               && tseries_equal_check(&y, &d2),
               "genus 0: phi_0'' = inverse of sqrt(y)J_1(2sqrt(y)) to x^%ld", (long) (N0 - 2));
    tseries_derivative(&dy, &y, X, ctx);
    tseries_log(&lg, &dy, ctx);
    fmpq_set_si(c, 1, 24);
    tseries_scalar_mul_fmpq(&lg, &lg, c, ctx);
    tseries_truncate(&lg, N1, ctx);
    UNIT_CHECK(&rep, free_energy(&phi, 1, N1, &S, T, 1) == SPEC_OK && lg.order == N1
               && tseries_equal_check(&phi, &lg), "genus 1: phi_1 = log(y')/24 to x^%ld", (long) N1);
    tseries_clear(&phi, ctx), tseries_clear(&d2, ctx), tseries_clear(&xs, ctx);
    tseries_clear(&y, ctx), tseries_clear(&dy, ctx), tseries_clear(&lg, ctx);
    fmpq_clear(c);
}

/* p = exp(-(s_1 z + ... + s_NS z^NS)) = sum_k p_k(s) z^k to order K (generic tseries path).
   p is initialised by the caller; its var and order are set here. */
static void kmz_p_series(tseries *p, slong K)
{
    tseries a;
    fmpq_mpoly_t m, z;
    slong j;
    tseries_init(&a, ZV, K, ctx);
    fmpq_mpoly_init(m, ctx), fmpq_mpoly_init(z, ctx);
    for (j = 1; j <= NS; j++) {
        fmpq_mpoly_gen(m, j, ctx);
        fmpq_mpoly_gen(z, ZV, ctx);
        fmpq_mpoly_pow_ui(z, z, (ulong) j, ctx);
        fmpq_mpoly_mul(m, m, z, ctx);
        fmpq_mpoly_sub(a.p, a.p, m, ctx);
    }
    tseries_set_mpoly(&a, a.p, ctx);
    p->var = ZV, p->order = K;
    tseries_exp(p, &a, ctx);
    tseries_clear(&a, ctx);
    fmpq_mpoly_clear(m, ctx), fmpq_mpoly_clear(z, ctx);
}

/* Adds to res the terms prod_{j>=j0} s_j^{a_j}/a_j! pf_integral(psi^d kappa^a) over all
   a_{j0..NS} with sum j a_j = R (a_1..a_{j0-1} already in km, their factor in pre). */
static int kmz_direct_rec(fmpq_mpoly_t res, wk_table *T, slong g, const slong *d, slong n,
                          slong *km, slong j0, slong R, const fmpq_mpoly_t pre)
{
    fmpq_mpoly_t f, sj;
    fmpq_t v;
    slong a;
    int st = WK_OK;
    if (j0 > NS) {
        if (R != 0)
            return WK_OK;
        fmpq_init(v);
        st = pf_integral(v, T, g, d, n, km, NS);
        fmpq_mpoly_init(f, ctx);
        fmpq_mpoly_scalar_mul_fmpq(f, pre, v, ctx);
        fmpq_mpoly_add(res, res, f, ctx);
        fmpq_mpoly_clear(f, ctx), fmpq_clear(v);
        return st;
    }
    fmpq_mpoly_init(f, ctx), fmpq_mpoly_init(sj, ctx);
    fmpq_mpoly_set(f, pre, ctx);
    fmpq_mpoly_gen(sj, j0, ctx);
    for (a = 0; a * j0 <= R && st == WK_OK; a++) {
        if (a > 0) {
            fmpq_mpoly_mul(f, f, sj, ctx);
            fmpq_mpoly_scalar_div_si(f, f, a, ctx);
        }
        km[j0] = a;
        st = kmz_direct_rec(res, T, g, d, n, km, j0 + 1, R - a * j0, f);
    }
    km[j0] = 0;
    fmpq_mpoly_clear(f, ctx), fmpq_mpoly_clear(sj, ctx);
    return st;
}

/* res = int_{Mbar_{g,n}} exp(sum_j s_j kappa_j) prod psi_i^{d_i} by pf_integral expansions.
   Returns the first pf_integral status that is not WK_OK. */
static int kmz_direct(fmpq_mpoly_t res, wk_table *T, slong g, const slong *d, slong n)
{
    slong km[NS + 1] = {0}, i, R = 3 * g - 3 + n;
    fmpq_mpoly_t one;
    int st;
    for (i = 0; i < n; i++)
        R -= d[i];
    fmpq_mpoly_zero(res, ctx);
    if (R < 0)
        return WK_OK;
    fmpq_mpoly_init(one, ctx);
    fmpq_mpoly_one(one, ctx);
    st = kmz_direct_rec(res, T, g, d, n, km, 1, R, one);
    fmpq_mpoly_clear(one, ctx);
    return st;
}

/* res = coefficient of x^n y_1...y_n in F_g at the KMZ-shifted times with psi labels d.
   Returns the status of planning and evaluation. */
static int kmz_spec(fmpq_mpoly_t res, wk_table *T, slong g, const slong *d, slong n)
{
    times S = {0};
    tseries p, F;
    fmpq_mpoly_t c;
    slong vars[MAXN], i;
    ulong exps[MAXN];
    int st;
    S.kind = 1, S.n = n, S.fail_at = -1, S.p = &p;
    memcpy(S.d, d, (size_t) n * sizeof(slong));
    for (i = 0; i < n; i++)
        vars[i] = Y0 + i, exps[i] = 1;
    tseries_init(&p, ZV, 0, ctx), tseries_init(&F, X, n, ctx), fmpq_mpoly_init(c, ctx);
    kmz_p_series(&p, 3 * g - 1 + n);
    st = free_energy(&F, g, n, &S, T, 1);
    tseries_coeff(c, &F, n, ctx);
    if (n > 0)
        fmpq_mpoly_get_coeff_vars_ui(res, c, vars, exps, n, ctx);
    else
        fmpq_mpoly_set(res, c, ctx);
    tseries_clear(&p, ctx), tseries_clear(&F, ctx), fmpq_mpoly_clear(c, ctx);
    return st;
}

/* Hand examples (derived in the comments, genus-0 correlators from (n-3)!/prod d_i!, from
   memory): Mbar_{0,5}: kappa_1^2 = <tau_0^5 tau_2^2> - <tau_0^5 tau_3> = 6 - 1 = 5, kappa_2 =
   <tau_0^5 tau_3> = 1, so int exp(s1 k1 + s2 k2) = 5/2 s1^2 + s2; Mbar_{1,1}: int exp(...) = s1/24
   and int psi_1 exp(...) = 1/24.  Both sides (spec and pf_integral) must give these. */
static void test_kmz_hand(wk_table *T)
{
    static const struct { slong g, n, d[MAXN]; const char *expect; } ex[] = {
        {0, 5, {0, 0, 0, 0, 0}, "5/2*s1^2 + s2"}, {1, 1, {0}, "s1/24"}, {1, 1, {1}, "1/24"},
        {0, 4, {1, 0, 0, 0}, "1"}, {0, 4, {0, 0, 0, 0}, "s1"}};
    fmpq_mpoly_t a, b, e;
    size_t i;
    fmpq_mpoly_init(a, ctx), fmpq_mpoly_init(b, ctx), fmpq_mpoly_init(e, ctx);
    for (i = 0; i < sizeof ex / sizeof ex[0]; i++) {
        fmpq_mpoly_set_str_pretty(e, ex[i].expect, names, ctx);
        UNIT_CHECK(&rep, kmz_spec(a, T, ex[i].g, ex[i].d, ex[i].n) == SPEC_OK
                   && fmpq_mpoly_equal(a, e, ctx), "hand example %zu via the time shift (%s)", i,
                   ex[i].expect);
        UNIT_CHECK(&rep, kmz_direct(b, T, ex[i].g, ex[i].d, ex[i].n) == WK_OK
                   && fmpq_mpoly_equal(b, e, ctx), "hand example %zu via pf_integral (%s)", i,
                   ex[i].expect);
    }
    fmpq_mpoly_clear(a, ctx), fmpq_mpoly_clear(b, ctx), fmpq_mpoly_clear(e, ctx);
}

/* Property test on random (g, n, d): time shift = direct pushforward expansion.
   g <= 2 and at most 7 points keep both sides cheap. */
static void test_kmz_random(wk_table *T)
{
    slong g = (slong) n_randint(state, 3), n, d[MAXN] = {0}, i, room;
    fmpq_mpoly_t a, b;
    n = g == 0 ? 3 + (slong) n_randint(state, 4) : (slong) n_randint(state, g == 1 ? 5 : 4) + (g == 1);
    room = 3 * g - 3 + n;
    for (i = 0; i < n; i++) {
        d[i] = (slong) n_randint(state, (ulong) FLINT_MIN(room, 3) + 1);
        room -= d[i];
    }
    fmpq_mpoly_init(a, ctx), fmpq_mpoly_init(b, ctx);
    UNIT_CHECK(&rep, kmz_spec(a, T, g, d, n) == SPEC_OK && kmz_direct(b, T, g, d, n) == WK_OK
               && fmpq_mpoly_equal(a, b, ctx), "property KMZ time shift = pf_integral, g=%ld n=%ld "
               "d=(%ld,%ld,%ld,...)", (long) g, (long) n, (long) (n > 0 ? d[0] : -1),
               (long) (n > 1 ? d[1] : -1), (long) (n > 2 ? d[2] : -1));
    fmpq_mpoly_clear(a, ctx), fmpq_mpoly_clear(b, ctx);
}

/* Genus 1 with t_0 = 0, t_1 = x, t_k = 0 (k >= 2): F_1 = sum_m <tau_1^m>_1 x^m/m! =
   -(1/24) log(1 - x), since <tau_1^m>_1 = (m-1)!/24 by the dilaton equation (property test). */
static void test_dilaton(wk_table *T)
{
    times S = {0};
    tseries F, l;
    fmpq_mpoly_t p;
    fmpq_t c;
    const slong N = 15;
    S.kind = 2, S.t0 = "0", S.t1 = "x", S.fail_at = -1;
    tseries_init(&F, X, N, ctx), tseries_init(&l, X, N, ctx);
    fmpq_mpoly_init(p, ctx), fmpq_init(c);
    fmpq_mpoly_set_str_pretty(p, "1 - x", names, ctx);
    tseries_set_mpoly(&l, p, ctx);
    tseries_log(&l, &l, ctx);
    fmpq_set_si(c, -1, 24);
    tseries_scalar_mul_fmpq(&l, &l, c, ctx);
    UNIT_CHECK(&rep, free_energy(&F, 1, N, &S, T, 1) == SPEC_OK && tseries_equal_check(&F, &l),
               "property F_1(t_1 = x) = -log(1-x)/24 (dilaton)");
    tseries_clear(&F, ctx), tseries_clear(&l, ctx);
    fmpq_mpoly_clear(p, ctx), fmpq_clear(c);
}

/* The rational fast path and the generic tseries path of spec_plan_evaluate agree exactly.
   At the WP point (rational times), forcing the generic path once. */
static void test_fast_vs_generic(slong g, slong N, wk_table *T)
{
    times S = {0};
    tseries a, b;
    S.fail_at = -1;
    tseries_init(&a, X, N, ctx), tseries_init(&b, X, N, ctx);
    UNIT_CHECK(&rep, free_energy(&a, g, N, &S, T, 1) == SPEC_OK
               && free_energy(&b, g, N, &S, T, 0) == SPEC_OK && tseries_equal_check(&a, &b)
               && !fmpq_mpoly_is_zero(a.p, ctx), "fast and generic evaluation agree, g=%ld N=%ld",
               (long) g, (long) N);
    tseries_clear(&a, ctx), tseries_clear(&b, ctx);
}

/* spec_plan_print mentions the needed times with their valuations and the correlator count.
   The output goes to a memory stream. */
static void test_print(void)
{
    times S = {0};
    spec_plan *P;
    char *buf = NULL;
    size_t len = 0;
    FILE *f = open_memstream(&buf, &len);
    S.fail_at = -1, S.order = 3;
    spec_plan_build(&P, 1, 3, times_valuation, &S, 1e6);
    spec_plan_print(f, P);
    fclose(f);
    UNIT_CHECK(&rep, P != NULL && strstr(buf, "t_0:1 t_2:0 t_3:0 t_4:0") != NULL
               && strstr(buf, "t_1:") == NULL && strstr(buf, "correlators") != NULL,
               "plan print for F_1 to x^3:\n%s", buf);
    spec_plan_free(P);
    free(buf);
}

/* A plan without any multiset (F_0 to x^2 at the WP point: every genus-0 term needs 3 points)
   evaluates to the zero series of the requested order without reading any time. */
static void test_empty_plan(wk_table *T)
{
    times S = {0};
    spec_plan *P;
    tseries F;
    S.fail_at = -1, S.order = 2;
    tseries_init(&F, X, 7, ctx);
    fmpq_mpoly_one(F.p, ctx);
    UNIT_CHECK(&rep, spec_plan_build(&P, 0, 2, times_valuation, &S, 10) == SPEC_OK
               && spec_plan_terms(P) == 0 && spec_plan_max_k(P) == -1
               && spec_plan_evaluate(&F, P, T, NULL, ctx) == SPEC_OK && F.order == 2
               && fmpq_mpoly_is_zero(F.p, ctx), "empty plan gives the zero series");
    spec_plan_free(P);
    tseries_clear(&F, ctx);
}

/* Builds a plan for scenario S and expects status st (and no plan on error).
   Releases the plan if one was built. */
static void expect_build(times *S, slong g, slong N, double max_terms, int st, const char *what)
{
    spec_plan *P = (spec_plan *) &rep;     /* any non-NULL value: must be reset */
    S->order = N;
    UNIT_CHECK(&rep, spec_plan_build(&P, g, N, times_valuation, S, max_terms) == st
               && (st == SPEC_OK) == (P != NULL), "error code: %s", what);
    spec_plan_free(P);
}

/* Evaluation errors: valuation below the plan, mixed variables, correlator engine limit.
   Each failure must leave the error series (order -1). */
static void test_eval_errors(void)
{
    times S = {0};
    spec_plan *P;
    tseries *t, res;
    wk_table *T = wk_table_new();
    slong K;
    S.kind = 2, S.t0 = "x^2", S.t1 = "0", S.wp_tail = 1, S.fail_at = -1, S.order = 6;
    spec_plan_build(&P, 1, 6, times_valuation, &S, 1e6);
    K = spec_plan_max_k(P);
    S.t0 = "x";
    t = times_array(&S, K);
    tseries_init(&res, X, 6, ctx);
    UNIT_CHECK(&rep, spec_plan_evaluate(&res, P, T, t, ctx) == SPEC_MISMATCH && res.order == -1,
               "error code: t_0 of valuation 1 against a plan for valuation 2");
    times_free(t, K);
    S.t0 = "x^3";
    t = times_array(&S, K);
    UNIT_CHECK(&rep, spec_plan_evaluate(&res, P, T, t, ctx) == SPEC_OK && res.order == 6,
               "a higher valuation than planned is accepted");
    t[2].var = ZV;
    UNIT_CHECK(&rep, spec_plan_evaluate(&res, P, T, t, ctx) == SPEC_MISMATCH,
               "error code: series in different main variables");
    t[2].var = X;
    UNIT_CHECK(&rep, spec_plan_evaluate(&res, NULL, T, t, ctx) == SPEC_BADARG, "error code: NULL plan");
    times_free(t, K);
    wk_table_free(T);
    T = wk_table_new();
    wk_table_set_limit(T, 20);
    S.kind = 0;
    UNIT_CHECK(&rep, free_energy(&res, 3, 8, &S, T, 1) == SPEC_WK && res.order == -1,
               "error code: correlator engine limit (20 memo entries for F_3 to x^8)");
    tseries_clear(&res, ctx);
    spec_plan_free(P);
    wk_table_free(T);
}

/* Planning errors: constant t_0 / t_1, too big, callback failure, bad arguments.
   Each failure must leave *P == NULL. */
static void test_build_errors(void)
{
    times S = {0};
    S.kind = 2, S.wp_tail = 1, S.fail_at = -1;
    S.t0 = "1 + x", S.t1 = "0";
    expect_build(&S, 1, 5, 1e6, SPEC_T0_CONSTANT, "t_0 with a constant term");
    S.t0 = "x", S.t1 = "2 + x";
    expect_build(&S, 1, 5, 1e6, SPEC_T1_CONSTANT, "t_1 with a constant term");
    S.t1 = "x^2";
    expect_build(&S, 1, 5, 1e6, SPEC_OK, "t_1 of valuation 2 is fine");
    S.t1 = "0";
    expect_build(&S, 4, 20, 100, SPEC_TOO_BIG, "more multisets than max_terms");
    S.fail_at = 5;
    expect_build(&S, 2, 4, 1e6, -7, "the callback's own error code is passed through");
    S.fail_at = -1;
    expect_build(&S, -1, 4, 1e6, SPEC_BADARG, "negative genus");
    expect_build(&S, 1, -1, 1e6, SPEC_BADARG, "negative order");
    expect_build(&S, 1, 4, 0, SPEC_BADARG, "max_terms = 0");
    UNIT_CHECK(&rep, spec_plan_build(NULL, 1, 4, times_valuation, &S, 1e6) == SPEC_BADARG,
               "error code: NULL plan pointer");
}

/* Sets up variable names: x, s1..s3, z, y0..y7, v_i otherwise, pi last.
   Must run before any parsing or printing. */
static void names_init(void)
{
    slong i;
    for (i = 0; i < NVARS; i++) {
        if (i >= Y0 && i < Y0 + MAXN)
            snprintf(name_buf[i], sizeof name_buf[i], "y%ld", (long) (i - Y0));
        else if (i >= 1 && i <= NS)
            snprintf(name_buf[i], sizeof name_buf[i], "s%ld", (long) i);
        else
            snprintf(name_buf[i], sizeof name_buf[i], "v%ld", (long) i);
        names[i] = name_buf[i];
    }
    names[X] = "x", names[ZV] = "z", names[NVARS - 1] = "pi";
}

/* Runs every test (randomised loops scaled by PSIKAPPA_TEST_MULTIPLIER).
   Exit status nonzero iff a check failed. */
int main(void)
{
    wk_table *T = wk_table_new();
    long i, iters = unit_iterations(30);
    slong g;
    flint_randinit(state);
    fmpq_mpoly_ctx_init(ctx, NVARS, ORD_DEGLEX);
    names_init();
    test_m04(T);
    for (g = 0; g <= 5; g++)
        test_wp_point(g, 12, T);
    for (g = 0; g <= 4; g++)
        test_wp_plan_count(g, 10 + 3 * g);
    test_genus01(32, 26, T);
    test_dilaton(T);
    test_fast_vs_generic(2, 10, T);
    test_kmz_hand(T);
    for (i = 0; i < iters; i++)
        test_kmz_random(T);
    test_print();
    test_empty_plan(T);
    test_build_errors();
    test_eval_errors();
    wk_table_free(T);
    fmpq_mpoly_ctx_clear(ctx);
    flint_randclear(state);
    flint_cleanup();
    return unit_finish("test_spec", &rep);
}
