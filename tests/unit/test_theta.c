/* test_theta.c - Theta-psi numbers <Theta | tau_d>_g (src/engines/theta/theta.h), both routes.
 *
 * 1. Published values, each by the Virasoro route and by the KdV route.
 * 2. Closed forms: the genus-one family and the one-point family (g <= 15).
 * 3. Property tests (identities, not data): the tau_0 equation, the Virasoro constraint L_1 and
 *    the KdV equation on numbers of the Virasoro table, and the two routes against each other on
 *    random inputs (loop counts scale with PSIKAPPA_TEST_MULTIPLIER).
 * 4. Status codes.
 */
#include <string.h>
#include <flint/fmpz.h>
#include <flint/ulong_extras.h>
#include "theta/theta.h"
#include "unit.h"

static unit_report rep;
static theta_table *VT, *KT;

/* Prints g and d to stderr after a failure. */
static void print_list(slong g, const slong *d, slong n)
{
    slong i;
    fprintf(stderr, "    g=%ld d=(", (long) g);
    for (i = 0; i < n; i++)
        fprintf(stderr, i ? ",%ld" : "%ld", (long) d[i]);
    fprintf(stderr, ")\n");
}

/* r = n!! for odd n >= -1 (the product of the odd numbers up to n; (-1)!! = 1!! = 1). */
static void dfac(fmpz_t r, ulong n)
{
    ulong j;
    fmpz_one(r);
    for (j = 3; j <= n; j += 2)
        fmpz_mul_ui(r, r, j);
}

/* v = v / c for a small integer c (FLINT 2.9 has no fmpq_div_si). */
static void div_si(fmpq_t v, slong c)
{
    fmpz_t z;
    fmpz_init_set_si(z, c);
    fmpq_div_fmpz(v, v, z);
    fmpz_clear(z);
}

/* v = <Theta | tau_d>_g by the Virasoro table; failures of the call count as failed checks. */
static void vir(fmpq_t v, slong g, const slong *d, slong n)
{
    int st = theta_correlator(v, VT, g, d, n);
    UNIT_CHECK(&rep, st == WK_OK, "theta_correlator status %d", st);
}

/* Checks <Theta | tau_d>_g = num/den by both routes; src names the source. */
static void check_value(slong g, const slong *d, slong n, slong num, slong den, const char *src)
{
    fmpq_t v, w, e;
    fmpq_init(v);
    fmpq_init(w);
    fmpq_init(e);
    fmpq_set_si(e, num, (ulong) den);
    vir(v, g, d, n);
    theta_correlator(w, KT, g, d, n);
    UNIT_CHECK(&rep, fmpq_equal(v, e) && fmpq_equal(w, e), "value from %s", src);
    if (!fmpq_equal(v, e) || !fmpq_equal(w, e))
        print_list(g, d, n);
    fmpq_clear(v);
    fmpq_clear(w);
    fmpq_clear(e);
}

/* Published values.  The genus-2 and genus-3 numbers are the coefficients of
       log Z^BGW = -1/8 log(1-t_0) + 3/128 t_1/(1-t_0)^3 + 15/1024 t_2/(1-t_0)^5
                   + 63/1024 t_1^2/(1-t_0)^6 + O(genus 4)
   (P. Norbury, "A new cohomology class on the moduli space of curves", 2017, and N. Do,
   P. Norbury, "Topological recursion on the Bessel curve", 2018; quoted from memory, the
   expansion being confirmed by both recursions below).  t_1^2/2! gives <tau_1^2>_3 = 63/512; the
   power of 1/(1-t_0) gives the tau_0 insertions, e.g. <tau_0 tau_1>_2 = 3 * 3/128. */
static void test_published(void)
{
    slong d0[1] = {0}, d1[1] = {1}, d2[1] = {2}, d11[2] = {1, 1}, d01[2] = {0, 1}, d001[3] = {0, 0, 1};
    slong d011[3] = {0, 1, 1}, d02[2] = {0, 2};
    check_value(1, d0, 1, 1, 8, "Norbury 2017: int over Mbar_{1,1} of Theta = 1/8");
    check_value(2, d1, 1, 3, 128, "Norbury 2017 / Do-Norbury 2018 (from memory)");
    check_value(3, d2, 1, 15, 1024, "Norbury 2017 / Do-Norbury 2018 (from memory)");
    check_value(3, d11, 2, 63, 512, "Norbury 2017 / Do-Norbury 2018 (from memory)");
    check_value(2, d01, 2, 9, 128, "3/128 t_1/(1-t_0)^3, t_0 t_1 coefficient (from memory)");
    check_value(2, d001, 3, 36, 128, "3/128 t_1/(1-t_0)^3, t_0^2 t_1/2! coefficient (from memory)");
    check_value(3, d02, 2, 75, 1024, "15/1024 t_2/(1-t_0)^5, t_0 t_2 coefficient (from memory)");
    check_value(3, d011, 3, 6 * 63, 512, "63/1024 t_1^2/(1-t_0)^6, t_0 t_1^2/2! coefficient (from memory)");
}

/* Genus one: -1/8 log(1-t_0) = sum_n t_0^n/(8n), so <Theta | tau_0^n>_1 = (n-1)!/8 (Norbury 2017,
   the genus-one part of log Z^BGW; from memory, and it follows from the tau_0 equation). */
static void test_genus_one(void)
{
    slong d[24], n;
    fmpq_t v, w, e;
    fmpq_init(v);
    fmpq_init(w);
    fmpq_init(e);
    memset(d, 0, sizeof d);
    for (n = 1; n <= 24; n++) {
        fmpz_fac_ui(fmpq_numref(e), (ulong) (n - 1));
        fmpz_set_ui(fmpq_denref(e), 8);
        fmpq_canonicalise(e);
        vir(v, 1, d, n);
        theta_correlator(w, KT, 1, d, n);
        UNIT_CHECK(&rep, fmpq_equal(v, e) && fmpq_equal(w, e), "<Theta|tau_0^%ld>_1 = (n-1)!/8", (long) n);
    }
    fmpq_clear(v);
    fmpq_clear(w);
    fmpq_clear(e);
}

/* One point: <Theta | tau_{g-1}>_g = (2g-1)!! (2g-3)!! / (8^g g!) (Do-Norbury 2018, the one-point
   function of the Bessel curve; recalled from memory and confirmed here by both recursions). */
static void test_one_point(void)
{
    slong g, d[1];
    fmpq_t v, w, e;
    fmpz_t a, b;
    fmpq_init(v);
    fmpq_init(w);
    fmpq_init(e);
    fmpz_init(a);
    fmpz_init(b);
    for (g = 1; g <= 15; g++) {
        d[0] = g - 1;
        dfac(a, (ulong) (2 * g - 1));
        dfac(b, (ulong) (g >= 2 ? 2 * g - 3 : 1));
        fmpz_mul(fmpq_numref(e), a, b);
        fmpz_fac_ui(fmpq_denref(e), (ulong) g);
        fmpz_mul_2exp(fmpq_denref(e), fmpq_denref(e), (ulong) (3 * g));
        fmpq_canonicalise(e);
        vir(v, g, d, 1);
        theta_correlator(w, KT, g, d, 1);
        UNIT_CHECK(&rep, fmpq_equal(v, e) && fmpq_equal(w, e), "one-point closed form, g = %ld", (long) g);
    }
    fmpq_clear(v);
    fmpq_clear(w);
    fmpq_clear(e);
    fmpz_clear(a);
    fmpz_clear(b);
}

/* v = <Theta | tau_d> with the genus fixed by the degree (sum d + 1), from the Virasoro table. */
static void th(fmpq_t v, const slong *d, slong n)
{
    slong i, g = 1;
    for (i = 0; i < n; i++)
        g += d[i];
    vir(v, g, d, n);
}

/* Random composition of D into n >= 1 parts. */
static void rand_composition(flint_rand_t st, slong *d, slong n, slong D)
{
    slong i;
    for (i = 0; i < n; i++)
        d[i] = 0;
    for (i = 0; i < D; i++)
        d[n_randint(st, (ulong) n)]++;
}

/* Property test (identity): the tau_0 equation <tau_0 tau_S>_g = (2g-2+|S|) <tau_S>_g. */
static void test_tau0(flint_rand_t st)
{
    long it, iters = unit_iterations(400);
    slong d[12], n, g;
    fmpq_t a, b;
    fmpq_init(a);
    fmpq_init(b);
    for (it = 0; it < iters; it++) {
        g = 1 + (slong) n_randint(st, 9);
        n = 1 + (slong) n_randint(st, 6);
        rand_composition(st, d + 1, n, g - 1);
        d[0] = 0;
        th(a, d, n + 1);
        th(b, d + 1, n);
        fmpq_mul_si(b, b, 2 * g - 2 + n);
        UNIT_CHECK(&rep, fmpq_equal(a, b), "tau_0 equation");
        if (!fmpq_equal(a, b))
            print_list(g, d, n + 1);
    }
    fmpq_clear(a);
    fmpq_clear(b);
}

/* rhs += sum over position subsets I of S (|S| = ns) of <tau_x tau_I><tau_y tau_J>, with zx, zy
   extra tau_0 beside x and y; buffers of length ns + 6. */
static void add_split(fmpq_t rhs, slong x, slong zx, slong y, slong zy, const slong *S, slong ns, slong c)
{
    slong mask, i, n1, n2, b1[20], b2[20];
    fmpq_t u, w;
    fmpq_init(u);
    fmpq_init(w);
    for (mask = 0; mask < (WORD(1) << ns); mask++) {
        n1 = 0;
        n2 = 0;
        b1[n1++] = x;
        b2[n2++] = y;
        for (i = 0; i < zx; i++)
            b1[n1++] = 0;
        for (i = 0; i < zy; i++)
            b2[n2++] = 0;
        for (i = 0; i < ns; i++) {
            if (mask >> i & 1)
                b1[n1++] = S[i];
            else
                b2[n2++] = S[i];
        }
        th(u, b1, n1);
        th(w, b2, n2);
        fmpq_mul(u, u, w);
        fmpq_mul_si(u, u, c);
        fmpq_add(rhs, rhs, u);
    }
    fmpq_clear(u);
    fmpq_clear(w);
}

/* Property test (identity): the KdV equation in Witten's correlator form, differentiated by t_M,
   on numbers of the Virasoro table, for k >= 1 and any M (zeros allowed, k not necessarily the
   largest index, so this is not the step theta_kdv.c uses):
   (2k+1)<tau_k tau_0^2 tau_M> = sum_{I+J=M} [<tau_{k-1} tau_0 tau_I><tau_0^3 tau_J>
                                 + 2<tau_{k-1} tau_0^2 tau_I><tau_0^2 tau_J>] + 1/4 <tau_{k-1} tau_0^4 tau_M>. */
static void test_kdv_equation(flint_rand_t st)
{
    long it, iters = unit_iterations(300);
    slong M[8], key[16], nm, k, i;
    fmpq_t lhs, rhs, t;
    fmpq_init(lhs);
    fmpq_init(rhs);
    fmpq_init(t);
    for (it = 0; it < iters; it++) {
        k = 1 + (slong) n_randint(st, 5);
        nm = (slong) n_randint(st, 6);
        if (nm > 0)
            rand_composition(st, M, nm, (slong) n_randint(st, 7));
        key[0] = k;
        key[1] = key[2] = 0;
        for (i = 0; i < nm; i++)
            key[3 + i] = M[i];
        th(lhs, key, nm + 3);
        fmpq_mul_si(lhs, lhs, 2 * k + 1);
        fmpq_zero(rhs);
        add_split(rhs, k - 1, 1, 0, 2, M, nm, 1);
        add_split(rhs, k - 1, 2, 0, 1, M, nm, 2);
        key[0] = k - 1;
        key[3] = key[4] = 0;
        for (i = 0; i < nm; i++)
            key[5 + i] = M[i];
        th(t, key, nm + 5);
        div_si(t, 4);
        fmpq_add(rhs, rhs, t);
        UNIT_CHECK(&rep, fmpq_equal(lhs, rhs), "KdV equation, k = %ld, |M| = %ld", (long) k, (long) nm);
    }
    fmpq_clear(lhs);
    fmpq_clear(rhs);
    fmpq_clear(t);
}

/* Property test (identity): the Virasoro constraint L_m for any m >= 1 and any S (zeros allowed,
   tau_m not necessarily the largest index, unlike the step of theta_vir.c):
   (2m+1)!! <tau_m tau_S>_g = sum_j (2m+2d_j+1)!!/(2d_j-1)!! <tau_{m+d_j} tau_{S\j}>
       + 1/2 sum_{r+s=m-1} (2r+1)!!(2s+1)!! [<tau_r tau_s tau_S>_{g-1} + sum_{I+J=S} <tau_r tau_I><tau_s tau_J>]. */
static void test_virasoro(flint_rand_t st)
{
    long it, iters = unit_iterations(300);
    slong S[8], key[12], ns, m, j, r;
    fmpq_t lhs, rhs, t;
    fmpz_t a, b;
    fmpq_init(lhs);
    fmpq_init(rhs);
    fmpq_init(t);
    fmpz_init(a);
    fmpz_init(b);
    for (it = 0; it < iters; it++) {
        m = 1 + (slong) n_randint(st, 4);
        ns = (slong) n_randint(st, 6);
        if (ns > 0)
            rand_composition(st, S, ns, (slong) n_randint(st, 6));
        key[0] = m;
        memcpy(key + 1, S, (size_t) ns * sizeof(slong));
        th(lhs, key, ns + 1);
        dfac(a, (ulong) (2 * m + 1));
        fmpq_mul_fmpz(lhs, lhs, a);
        fmpq_zero(rhs);
        for (j = 0; j < ns; j++) {
            memcpy(key, S, (size_t) ns * sizeof(slong));
            key[j] += m;
            th(t, key, ns);
            dfac(a, (ulong) (2 * m + 2 * S[j] + 1));
            dfac(b, (ulong) (S[j] == 0 ? 1 : 2 * S[j] - 1));
            fmpq_mul_fmpz(t, t, a);
            fmpq_div_fmpz(t, t, b);
            fmpq_add(rhs, rhs, t);
        }
        for (r = 0; r <= m - 1; r++) {
            slong s = m - 1 - r;
            fmpq_t q;
            fmpq_init(q);
            key[0] = r;
            key[1] = s;
            memcpy(key + 2, S, (size_t) ns * sizeof(slong));
            th(q, key, ns + 2);
            add_split(q, r, 0, s, 0, S, ns, 1);
            dfac(a, (ulong) (2 * r + 1));
            dfac(b, (ulong) (2 * s + 1));
            fmpz_mul(a, a, b);
            fmpq_mul_fmpz(q, q, a);
            div_si(q, 2);
            fmpq_add(rhs, rhs, q);
            fmpq_clear(q);
        }
        UNIT_CHECK(&rep, fmpq_equal(lhs, rhs), "Virasoro L_%ld, |S| = %ld", (long) m, (long) ns);
    }
    fmpq_clear(lhs);
    fmpq_clear(rhs);
    fmpq_clear(t);
    fmpz_clear(a);
    fmpz_clear(b);
}

/* Property test: the Virasoro route against the KdV route on random inputs of genus <= 11, each
   route with its own table (no shared values).  Prints the number of agreements. */
static void test_routes(flint_rand_t st)
{
    long it, iters = unit_iterations(5000), agree = 0;
    slong d[10], n, g;
    fmpq_t a, b;
    fmpq_init(a);
    fmpq_init(b);
    for (it = 0; it < iters; it++) {
        g = 1 + (slong) n_randint(st, 11);
        n = 1 + (slong) n_randint(st, 10);
        rand_composition(st, d, n, g - 1);
        theta_correlator(a, VT, g, d, n);
        theta_correlator(b, KT, g, d, n);
        if (fmpq_equal(a, b) && !fmpq_is_zero(a))
            agree++;
        else
            print_list(g, d, n);
    }
    UNIT_CHECK(&rep, agree == iters, "routes agree on %ld of %ld", agree, iters);
    printf("test_theta: Virasoro and KdV routes agree on %ld of %ld random Theta-psi numbers\n", agree, iters);
    fmpq_clear(a);
    fmpq_clear(b);
}

/* Status codes, zero by degree and in genus 0, the entry limit. */
static void test_errors(void)
{
    slong d[3] = {0, 0, 0}, bad[1] = {-1}, big[1] = {THETA_MAX_GENUS};
    fmpq_t v;
    theta_table *S = theta_table_new(THETA_ROUTE_VIRASORO);
    fmpq_init(v);
    UNIT_CHECK(&rep, theta_table_new(7) == NULL, "bad route");
    UNIT_CHECK(&rep, theta_correlator(v, VT, 0, d, 3) == WK_OK && fmpq_is_zero(v), "genus 0 is zero");
    UNIT_CHECK(&rep, theta_correlator(v, VT, 1, d, 0) == WK_UNSTABLE, "Mbar_{1,0} unstable");
    UNIT_CHECK(&rep, theta_correlator(v, VT, 2, bad, 1) == WK_BADARG, "negative index");
    UNIT_CHECK(&rep, theta_correlator(v, VT, 2, d, 2) == WK_OK && fmpq_is_zero(v), "degree mismatch");
    UNIT_CHECK(&rep, theta_correlator(v, VT, THETA_MAX_GENUS + 1, big, 1) == WK_LIMIT, "genus limit");
    theta_table_set_limit(S, 3);
    big[0] = 12;
    UNIT_CHECK(&rep, theta_correlator(v, S, 13, big, 1) == WK_LIMIT && fmpq_is_zero(v), "entry limit");
    {   /* every zero-free key of genus <= 10 is a partition of 0..9: the estimate bounds the memo */
        theta_table *E = theta_table_new(THETA_ROUTE_KDV);
        slong g, p[9] = {1, 1, 1, 1, 1, 1, 1, 1, 1};
        for (g = 2; g <= 10; g++)
            theta_correlator(v, E, g, p, g - 1);
        UNIT_CHECK(&rep, (double) theta_table_entries(E) <= theta_estimate_entries(10)
                             && theta_table_entries(E) > 0, "memo within the estimate");
        theta_table_free(E);
    }
    fmpq_clear(v);
    theta_table_free(S);
}

int main(void)
{
    flint_rand_t st;
    flint_randinit(st);
    VT = theta_table_new(THETA_ROUTE_VIRASORO);
    KT = theta_table_new(THETA_ROUTE_KDV);
    test_published();
    test_genus_one();
    test_one_point();
    test_tau0(st);
    test_kdv_equation(st);
    test_virasoro(st);
    test_routes(st);
    test_errors();
    theta_table_free(VT);
    theta_table_free(KT);
    flint_randclear(st);
    flint_cleanup();
    return unit_finish("test_theta", &rep);
}
