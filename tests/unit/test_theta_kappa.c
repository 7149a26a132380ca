/* test_theta_kappa.c - kappa classes against Theta and the super volume coefficients
 * (src/engines/theta/theta.h).
 *
 * 1. Property test: the set-partition pushforward against the time shift on random integrands,
 *    and both against a third computation written here, the forgetful recursion
 *        int_{g,n} Theta psi^d kappa_b prod_{a in K} kappa_a
 *            = int_{g,n+1} Theta psi^d psi_{n+1}^b prod_{a in K} (kappa_a - psi_{n+1}^a)
 *    (projection formula with Theta_{g,n+1} = psi_{n+1} pi^* Theta_{g,n} and pi^* kappa_a =
 *    kappa_a - psi_{n+1}^a, Arbarello-Cornalba 1996).
 * 2. Values: small integrals worked out by hand from the formula, the genus-one super volumes and
 *    V^Theta_{2,1}(L).
 * 3. Status codes.
 */
#include <string.h>
#include <flint/fmpz.h>
#include <flint/ulong_extras.h>
#include "theta/theta.h"
#include "unit.h"

static unit_report rep;
static theta_table *VT, *KT;

/* int_{g,n} Theta psi^d prod_{j<m} kappa_{b_j} by the forgetful recursion of the file comment,
   removing the last kappa factor; psi-only integrals come from the KdV table. */
static void forget(fmpq_t res, slong g, const slong *d, slong n, const slong *b, slong m)
{
    slong d2[24], mask, j, nk, b2[12];
    fmpq_t t;
    if (m == 0) {
        theta_correlator(res, KT, g, d, n);
        return;
    }
    fmpq_init(t);
    fmpq_zero(res);
    for (mask = 0; mask < (WORD(1) << (m - 1)); mask++) {   /* which kappa_a become -psi^a */
        memcpy(d2, d, (size_t) n * sizeof(slong));
        d2[n] = b[m - 1];
        nk = 0;
        for (j = 0; j < m - 1; j++) {
            if (mask >> j & 1)
                d2[n] += b[j];
            else
                b2[nk++] = b[j];
        }
        forget(t, g, d2, n + 1, b2, nk);
        if ((m - 1 - nk) % 2)
            fmpq_neg(t, t);
        fmpq_add(res, res, t);
    }
    fmpq_clear(t);
}

/* Random composition of D into n parts (n >= 1; nothing for n = 0). */
static void rand_composition(flint_rand_t st, slong *d, slong n, slong D)
{
    slong i;
    for (i = 0; i < n; i++)
        d[i] = 0;
    for (i = 0; n > 0 && i < D; i++)
        d[n_randint(st, (ulong) n)]++;
}

/* Property test: pushforward = time shift = forgetful recursion on random integrands of genus
   <= 10 with kappa indices 1..4.  Prints the number of agreements. */
static void test_routes(flint_rand_t st)
{
    long it, iters = unit_iterations(1500), agree = 0, nonzero = 0;
    slong g, n, K, m, j, d[8], b[12], kmult[5];
    fmpq_t a, s, f;
    fmpq_init(a);
    fmpq_init(s);
    fmpq_init(f);
    for (it = 0; it < iters; it++) {
        g = 2 + (slong) n_randint(st, 9);
        n = (slong) n_randint(st, 4);
        memset(kmult, 0, sizeof kmult);
        for (K = 0, m = 0; m < 8; m++) {              /* random kappa factors of total degree <= g-1 */
            slong j0 = 1 + (slong) n_randint(st, 4);
            if (K + j0 > g - 1 || n_randint(st, 5) == 0)
                break;
            kmult[j0]++;
            b[m] = j0;
            K += j0;
        }
        if (n == 0 && K != g - 1)
            n = 1;
        rand_composition(st, d, n, g - 1 - K);
        theta_kappa_pushforward(a, VT, g, d, n, kmult, 4, 0);
        theta_kappa_shift(s, KT, g, d, n, kmult, 4);
        for (j = 0, m = 0; j < 5; j++)
            m += kmult[j];
        forget(f, g, d, n, b, m);
        if (fmpq_equal(a, s) && fmpq_equal(a, f))
            agree++;
        nonzero += !fmpq_is_zero(a);
    }
    UNIT_CHECK(&rep, agree == iters, "kappa routes agree on %ld of %ld", agree, iters);
    UNIT_CHECK(&rep, nonzero > iters / 2, "most random integrals are nonzero (%ld)", nonzero);
    printf("test_theta_kappa: pushforward, time shift and forgetful recursion agree on %ld of %ld "
           "random integrals (%ld nonzero)\n", agree, iters, nonzero);
    fmpq_clear(a);
    fmpq_clear(s);
    fmpq_clear(f);
}

/* The super volume coefficient c_d against the pushforward of kappa_1^k, divided by k!. */
static void test_volume_coeff(flint_rand_t st)
{
    long it, iters = unit_iterations(300), agree = 0;
    slong g, n, k, d[4], kmult[2] = {0, 0};
    fmpq_t c, p;
    fmpz_t f;
    fmpq_init(c);
    fmpq_init(p);
    fmpz_init(f);
    for (it = 0; it < iters; it++) {
        g = 1 + (slong) n_randint(st, 12);
        n = 1 + (slong) n_randint(st, 3);
        k = (slong) n_randint(st, (ulong) g);
        rand_composition(st, d, n, g - 1 - k);
        kmult[1] = k;
        theta_volume_coeff(c, VT, g, d, n);
        theta_kappa_pushforward(p, KT, g, d, n, kmult, 1, 0);
        fmpz_fac_ui(f, (ulong) k);
        fmpq_div_fmpz(p, p, f);
        agree += fmpq_equal(c, p);
    }
    UNIT_CHECK(&rep, agree == iters, "volume coefficients agree on %ld of %ld", agree, iters);
    fmpq_clear(c);
    fmpq_clear(p);
    fmpz_clear(f);
}

/* Checks int_{g,n} Theta psi^d kappa^kmult = num/den by the pushforward and the time shift. */
static void check_kappa(slong g, const slong *d, slong n, const slong *kmult, slong kmax, slong num,
                        slong den, const char *what)
{
    fmpq_t a, s, e;
    fmpq_init(a);
    fmpq_init(s);
    fmpq_init(e);
    fmpq_set_si(e, num, (ulong) den);
    theta_kappa_pushforward(a, VT, g, d, n, kmult, kmax, 0);
    theta_kappa_shift(s, KT, g, d, n, kmult, kmax);
    UNIT_CHECK(&rep, fmpq_equal(a, e) && fmpq_equal(s, e), "%s", what);
    fmpq_clear(a);
    fmpq_clear(s);
    fmpq_clear(e);
}

/* Values worked out by hand from the pushforward formula and the published Theta-psi numbers
   (<Theta|tau_1>_2 = 3/128, <Theta|tau_2>_3 = 15/1024, <Theta|tau_1^2>_3 = 63/512: Norbury 2017,
   Do-Norbury 2018, from memory; see test_theta.c), and the super volumes.
   V^Theta_{1,n} = <Theta | tau_0^n>_1 = (n-1)!/8 and V^Theta_{2,1}(L) = 3 (L^2 + 12 pi^2)/256
   (P. Norbury, "Enumerative geometry via the moduli space of super Riemann surfaces", 2020;
   recalled from memory, confirmed by hand: V^Theta_{2,1}(L) = 2 pi^2 int Theta kappa_1
   + L^2/2 <Theta|tau_1>_2 with int_{Mbar_{2,1}} Theta kappa_1 = <Theta|tau_0 tau_1>_2 = 9/128). */
static void test_values(void)
{
    slong d0[6] = {0, 0, 0, 0, 0, 0}, d1[1] = {1}, k1[2] = {0, 1}, k11[2] = {0, 2}, k2[3] = {0, 0, 1};
    slong n, f = 1;
    fmpq_t c, e;
    fmpq_init(c);
    fmpq_init(e);
    check_kappa(2, d0, 0, k1, 1, 3, 128, "int_{Mbar_2} Theta kappa_1 = <tau_1>_2");
    check_kappa(2, d0, 1, k1, 1, 9, 128, "int_{Mbar_{2,1}} Theta kappa_1 = <tau_0 tau_1>_2");
    check_kappa(3, d0, 0, k11, 1, 111, 1024, "int_{Mbar_3} Theta kappa_1^2 = <tau_1^2>_3 - <tau_2>_3");
    check_kappa(3, d0, 0, k2, 2, 15, 1024, "int_{Mbar_3} Theta kappa_2 = <tau_2>_3");
    for (n = 1; n <= 6; n++) {
        f *= n > 1 ? n - 1 : 1;
        fmpq_set_si(e, f, 8);
        theta_volume_coeff(c, VT, 1, d0, n);
        UNIT_CHECK(&rep, fmpq_equal(c, e), "V^Theta_{1,%ld} = (n-1)!/8", (long) n);
    }
    theta_volume_coeff(c, VT, 2, d0, 1);
    fmpq_set_si(e, 9, 128);                          /* 2 pi^2 * 9/128 = 36 pi^2/256 */
    UNIT_CHECK(&rep, fmpq_equal(c, e), "V^Theta_{2,1}: constant term 3*12 pi^2/256");
    theta_volume_coeff(c, VT, 2, d1, 1);
    fmpq_set_si(e, 3, 128);                          /* (L^2/2) * 3/128 = 3 L^2/256 */
    UNIT_CHECK(&rep, fmpq_equal(c, e), "V^Theta_{2,1}: L^2 term 3/256");
    fmpq_clear(c);
    fmpq_clear(e);
}

/* Status codes of the kappa functions. */
static void test_errors(void)
{
    slong d[1] = {38}, d0[1] = {0}, d000[3] = {0, 0, 0}, km[2] = {0, 5}, bad[2] = {0, -1}, big[2] = {0, 61};
    fmpq_t v;
    fmpq_init(v);
    UNIT_CHECK(&rep, theta_kappa_pushforward(v, VT, 6, d0, 1, km, 1, 3) == WK_LIMIT, "term limit");
    UNIT_CHECK(&rep, theta_kappa_pushforward(v, VT, 6, d0, 1, km, 1, 0) == WK_OK && !fmpq_is_zero(v),
               "kappa_1^5 on Mbar_{6,1} without a limit");
    UNIT_CHECK(&rep, theta_kappa_pushforward(v, VT, 2, d0, 1, bad, 1, 0) == WK_BADARG, "negative kappa power");
    UNIT_CHECK(&rep, theta_kappa_shift(v, VT, 1, d0, 0, km, 0) == WK_UNSTABLE, "Mbar_{1,0}");
    UNIT_CHECK(&rep, theta_kappa_shift(v, VT, 100, d, 1, big, 1) == WK_LIMIT, "shift degree limit");
    UNIT_CHECK(&rep, theta_volume_coeff(v, VT, 0, d000, 3) == WK_OK && fmpq_is_zero(v), "genus 0 volume is 0");
    fmpq_clear(v);
}

int main(void)
{
    flint_rand_t st;
    flint_randinit(st);
    VT = theta_table_new(THETA_ROUTE_VIRASORO);
    KT = theta_table_new(THETA_ROUTE_KDV);
    test_routes(st);
    test_volume_coeff(st);
    test_values();
    test_errors();
    theta_table_free(VT);
    theta_table_free(KT);
    flint_randclear(st);
    flint_cleanup();
    return unit_finish("test_theta_kappa", &rep);
}
