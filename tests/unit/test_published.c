/* test_published.c - Weil-Petersson volumes from the engine against published polynomials.
 *
 * Normalisation used throughout (the plain integral, no orbifold correction):
 *     V_{g,n}(L) = int_{Mbar_{g,n}} exp(2 pi^2 kappa_1 + sum_i L_i^2 psi_i / 2),
 * so the coefficient of prod L_i^{2 a_i} pi^{2m} is
 *     2^m / (m! prod_i a_i! 2^{a_i}) * int prod psi_i^{a_i} kappa_1^m ,   m + sum a_i = 3g-3+n.
 * Mirzakhani's table (M. Mirzakhani, "Simple geodesics and Weil-Petersson volumes of moduli spaces
 * of bordered Riemann surfaces", Invent. Math. 167 (2007)) lists V_{1,1}(L) = (L^2 + 4 pi^2)/24,
 * twice the integral (every genus-1 curve with one point has the elliptic involution); with the
 * integral normalisation V_{1,1}(L) = (L^2 + 4 pi^2)/48, which is what is checked below.  The other
 * entries checked here carry no such factor.  All polynomials below are quoted from memory of
 * that table (and of P. Zograf's and Mirzakhani's later work for V_{3,0}).
 *
 * Note on the genus-0 sanity values: int_{Mbar_{0,4}} kappa_1 = 1 (V_{0,4} = 2 pi^2) and
 * int_{Mbar_{0,5}} kappa_1^2 = 5, i.e. int kappa_1^2 / 2! = 5/2 and V_{0,5} = (2 pi^2)^2 * 5/2 = 10 pi^4.
 */
#include <string.h>
#include <flint/fmpz.h>
#include "correlators/pushforward.h"
#include "unit.h"

static unit_report rep;

/* Dense polynomial in nv variables (x_1..x_n = L_i^2, then y = pi^2), exponents 0..D each.
   Owns its coefficient array (poly_init / poly_clear). */
typedef struct {
    slong nv, D, size;
    fmpq *c;
} poly;

/* Allocates the zero polynomial with nv variables and exponents up to D.
   Pairs with poly_clear. */
static void poly_init(poly *P, slong nv, slong D)
{
    slong i;
    P->nv = nv;
    P->D = D;
    for (i = 0, P->size = 1; i < nv; i++)
        P->size *= D + 1;
    P->c = flint_malloc((size_t) P->size * sizeof(fmpq));
    for (i = 0; i < P->size; i++)
        fmpq_init(P->c + i);
}

/* Releases the coefficients.
   P must have been initialised with poly_init. */
static void poly_clear(poly *P)
{
    slong i;
    for (i = 0; i < P->size; i++)
        fmpq_clear(P->c + i);
    flint_free(P->c);
}

/* Dense index of an exponent vector e (nv entries, each <= D).
   Mixed radix with base D+1, first variable least significant. */
static slong poly_index(const poly *P, const slong *e)
{
    slong i, idx = 0;
    for (i = P->nv - 1; i >= 0; i--)
        idx = idx * (P->D + 1) + e[i];
    return idx;
}

/* Writes the exponent vector of a dense index into e.
   Returns the total degree, used for the homogeneity check. */
static slong poly_exps(const poly *P, slong idx, slong *e)
{
    slong i, tot = 0;
    for (i = 0; i < P->nv; i++) {
        e[i] = idx % (P->D + 1);
        idx /= P->D + 1;
        tot += e[i];
    }
    return tot;
}

/* P += (num/den) * monomial e.
   den > 0. */
static void poly_add_term(poly *P, const slong *e, slong num, slong den)
{
    fmpq_t t;
    fmpq_init(t);
    fmpq_set_si(t, num, (ulong) den);
    fmpq_add(P->c + poly_index(P, e), P->c + poly_index(P, e), t);
    fmpq_clear(t);
}

/* R = A * B, dropping monomials with an exponent above D.
   R must be distinct from A and B (it is zeroed first). */
static void poly_mul(poly *R, const poly *A, const poly *B)
{
    slong i, j, k, ea[8], eb[8];
    for (i = 0; i < R->size; i++)
        fmpq_zero(R->c + i);
    for (i = 0; i < A->size; i++) {
        if (fmpq_is_zero(A->c + i))
            continue;
        poly_exps(A, i, ea);
        for (j = 0; j < B->size; j++) {
            int ok = !fmpq_is_zero(B->c + j);
            poly_exps(B, j, eb);
            for (k = 0; k < A->nv && ok; k++) {
                eb[k] += ea[k];
                ok = eb[k] <= R->D;
            }
            if (ok)
                fmpq_addmul(R->c + poly_index(R, eb), A->c + i, B->c + j);
        }
    }
}

/* P = (c_y * y + c_x * (x_1 + ... + x_n)) / den, a linear factor of a volume polynomial.
   The last variable is y = pi^2. */
static void poly_set_linear(poly *P, slong cy, slong cx, slong den)
{
    slong e[8] = {0}, i, n = P->nv - 1;
    for (i = 0; i < P->size; i++)
        fmpq_zero(P->c + i);
    e[n] = 1;
    poly_add_term(P, e, cy, den);
    e[n] = 0;
    for (i = 0; i < n; i++) {
        e[i] = 1;
        poly_add_term(P, e, cx, den);
        e[i] = 0;
    }
}

/* res = 2^m / (m! prod a_i! 2^{a_i}) * int_{Mbar_{g,n}} prod psi_i^{a_i} kappa_1^m,
   the coefficient of prod L_i^{2a_i} pi^{2m} in V_{g,n}; returns the engine status. */
static int wp_coeff(fmpq_t res, wk_table *T, slong g, const slong *a, slong n, slong m)
{
    slong km[2] = {0, m}, i;
    fmpz_t num, den, f;
    int st = pf_integral(res, T, g, a, n, km, 1);
    fmpz_init(num); fmpz_init(den); fmpz_init(f);
    fmpz_one(num);
    fmpz_mul_2exp(num, num, (ulong) m);
    fmpz_fac_ui(den, (ulong) m);
    for (i = 0; i < n; i++) {
        fmpz_fac_ui(f, (ulong) a[i]);
        fmpz_mul(den, den, f);
        fmpz_mul_2exp(den, den, (ulong) a[i]);
    }
    fmpq_mul_fmpz(res, res, num);
    fmpq_div_fmpz(res, res, den);
    fmpz_clear(num); fmpz_clear(den); fmpz_clear(f);
    return st;
}

/* Compares every coefficient of the published polynomial P (variables L_1^2..L_n^2, pi^2) with the
   engine; monomials of the wrong total degree must vanish in P. */
static void check_volume(wk_table *T, const char *name, slong g, slong n, const poly *P)
{
    slong idx, e[8], D = 3 * g - 3 + n, i, stray = 0;
    fmpq_t v;
    fmpq_init(v);
    for (idx = 0; idx < P->size; idx++) {
        if (poly_exps(P, idx, e) != D) {
            stray += !fmpq_is_zero(P->c + idx);
            continue;
        }
        UNIT_CHECK(&rep, wp_coeff(v, T, g, e, n, e[n]) == WK_OK, "%s: engine error", name);
        UNIT_CHECK(&rep, fmpq_equal(v, P->c + idx), "%s: coefficient mismatch", name);
        if (!fmpq_equal(v, P->c + idx)) {
            fprintf(stderr, "    L^2 exponents (");
            for (i = 0; i < n; i++)
                fprintf(stderr, i ? ",%ld" : "%ld", (long) e[i]);
            fprintf(stderr, "), pi^2 exponent %ld\n", (long) e[n]);
            unit_print_fmpq("engine", v);
            unit_print_fmpq("published", P->c + idx);
        }
    }
    UNIT_CHECK(&rep, stray == 0, "%s: published polynomial not homogeneous", name);
    fmpq_clear(v);
}

/* Halves every coefficient.
   Mirzakhani's V_{1,1} carries the orbifold factor 2 relative to the plain integral. */
static void poly_halve(poly *P)
{
    slong i;
    fmpz_t two;
    fmpz_init_set_ui(two, 2);
    for (i = 0; i < P->size; i++)
        fmpq_div_fmpz(P->c + i, P->c + i, two);
    fmpz_clear(two);
}

/* V_{0,4}(L) = (4 pi^2 + sum L_i^2)/2 and V_{1,1}(L) = (L^2 + 4 pi^2)/24 / 2 (Mirzakhani 2007, table;
   from memory; the /2 converts her orbifold convention to the plain integral). */
static void test_linear_volumes(wk_table *T)
{
    poly P;
    poly_init(&P, 5, 1);
    poly_set_linear(&P, 4, 1, 2);
    check_volume(T, "V_{0,4}", 0, 4, &P);
    poly_clear(&P);
    poly_init(&P, 2, 1);
    poly_set_linear(&P, 4, 1, 24);
    poly_halve(&P);
    check_volume(T, "V_{1,1}", 1, 1, &P);
    poly_clear(&P);
}

/* V_{0,5}(L) = (1/8) sum L_i^4 + (1/2) sum_{i<j} L_i^2 L_j^2 + 3 pi^2 sum L_i^2 + 10 pi^4
   (Mirzakhani 2007, table; from memory). */
static void test_v05(wk_table *T)
{
    poly P;
    slong e[6] = {0}, i, j;
    poly_init(&P, 6, 2);
    e[5] = 2;
    poly_add_term(&P, e, 10, 1);
    e[5] = 1;
    for (i = 0; i < 5; i++) {
        e[i] = 1;
        poly_add_term(&P, e, 3, 1);
        e[i] = 0;
    }
    e[5] = 0;
    for (i = 0; i < 5; i++)
        for (j = i; j < 5; j++) {
            e[i]++;
            e[j]++;
            poly_add_term(&P, e, 1, i == j ? 8 : 2);
            e[i] = e[j] = 0;
        }
    check_volume(T, "V_{0,5}", 0, 5, &P);
    poly_clear(&P);
}

/* V_{1,2}(L) = (4 pi^2 + L_1^2 + L_2^2)(12 pi^2 + L_1^2 + L_2^2)/192 (Mirzakhani 2007, table;
   from memory). */
static void test_v12(wk_table *T)
{
    poly A, B, P;
    poly_init(&A, 3, 2);
    poly_init(&B, 3, 2);
    poly_init(&P, 3, 2);
    poly_set_linear(&A, 4, 1, 1);
    poly_set_linear(&B, 12, 1, 192);
    poly_mul(&P, &A, &B);
    check_volume(T, "V_{1,2}", 1, 2, &P);
    poly_clear(&A);
    poly_clear(&B);
    poly_clear(&P);
}

/* V_{2,1}(L) = (4 pi^2 + L^2)(12 pi^2 + L^2)(6960 pi^4 + 384 pi^2 L^2 + 5 L^4)/2211840
   (Mirzakhani 2007, table; from memory). */
static void test_v21(wk_table *T)
{
    poly A, B, C, AB, P;
    slong e[2];
    poly_init(&A, 2, 4);
    poly_init(&B, 2, 4);
    poly_init(&C, 2, 4);
    poly_init(&AB, 2, 4);
    poly_init(&P, 2, 4);
    poly_set_linear(&A, 4, 1, 1);
    poly_set_linear(&B, 12, 1, 1);
    e[0] = 0; e[1] = 2; poly_add_term(&C, e, 6960, 2211840);
    e[0] = 1; e[1] = 1; poly_add_term(&C, e, 384, 2211840);
    e[0] = 2; e[1] = 0; poly_add_term(&C, e, 5, 2211840);
    poly_mul(&AB, &A, &B);
    poly_mul(&P, &AB, &C);
    check_volume(T, "V_{2,1}", 2, 1, &P);
    poly_clear(&A); poly_clear(&B); poly_clear(&C); poly_clear(&AB); poly_clear(&P);
}

/* Closed surfaces: V_{2,0} = 43 pi^6 / 2160 (Mirzakhani 2007, table; from memory) and
   V_{3,0} = 176557 pi^12 / 1209600 (from memory; tabulated e.g. by P. Zograf, "On the large genus
   asymptotics of Weil-Petersson volumes", 2008). */
static void test_closed(wk_table *T)
{
    poly P;
    slong e[1];
    poly_init(&P, 1, 3);
    e[0] = 3;
    poly_add_term(&P, e, 43, 2160);
    check_volume(T, "V_{2,0}", 2, 0, &P);
    poly_clear(&P);
    poly_init(&P, 1, 6);
    e[0] = 6;
    poly_add_term(&P, e, 176557, 1209600);
    check_volume(T, "V_{3,0}", 3, 0, &P);
    poly_clear(&P);
}

/* Zograf's genus-0 recursion (P. Zograf, "The Weil-Petersson volume of the moduli space of
   punctured spheres", Contemp. Math. 150, 1993; recalled from memory and re-derived by hand for
   n = 4, 5, 6 giving 1, 5, 61), for v_n = int_{Mbar_{0,n}} kappa_1^{n-3}:
     v_3 = 1,  v_n = 1/2 sum_{i=1}^{n-3} i (n-i-2)/(n-1) C(n-4, i-1) C(n, i+1) v_{i+2} v_{n-i}.
   Implemented here independently of the engine; V_{0,n} = (2 pi^2)^{n-3} v_n / (n-3)!. */
static void zograf_volumes(fmpq *v, slong nmax)
{
    slong n, i;
    fmpz_t b1, b2;
    fmpq_t t;
    fmpz_init(b1); fmpz_init(b2); fmpq_init(t);
    fmpq_one(v + 3);
    for (n = 4; n <= nmax; n++) {
        fmpq_zero(v + n);
        for (i = 1; i <= n - 3; i++) {
            fmpz_bin_uiui(b1, (ulong) (n - 4), (ulong) (i - 1));
            fmpz_bin_uiui(b2, (ulong) n, (ulong) (i + 1));
            fmpz_mul(b1, b1, b2);
            fmpz_mul_si(b1, b1, i * (n - i - 2));
            fmpq_mul(t, v + i + 2, v + n - i);
            fmpq_mul_fmpz(t, t, b1);
            fmpq_add(v + n, v + n, t);
        }
        fmpz_set_si(b1, 2 * (n - 1));
        fmpq_div_fmpz(v + n, v + n, b1);
    }
    fmpz_clear(b1); fmpz_clear(b2); fmpq_clear(t);
}

/* Engine's int_{Mbar_{0,n}} kappa_1^{n-3} against Zograf's recursion for n = 4..12, plus the
   known first values v_4..v_7 = 1, 5, 61, 1379 (from memory). */
static void test_zograf(wk_table *T)
{
    static const slong known[8] = {0, 0, 0, 1, 1, 5, 61, 1379};
    slong n, d[12] = {0}, km[2];
    fmpq v[13];
    fmpq_t x, k;
    for (n = 0; n <= 12; n++)
        fmpq_init(v + n);
    fmpq_init(x);
    fmpq_init(k);
    zograf_volumes(v, 12);
    for (n = 4; n <= 12; n++) {
        km[0] = 0;
        km[1] = n - 3;
        UNIT_CHECK(&rep, pf_integral(x, T, 0, d, n, km, 1) == WK_OK, "engine error, n=%ld", (long) n);
        UNIT_CHECK(&rep, fmpq_equal(x, v + n), "Zograf recursion vs engine, n=%ld", (long) n);
        if (!fmpq_equal(x, v + n)) {
            unit_print_fmpq("engine", x);
            unit_print_fmpq("Zograf", v + n);
        }
        if (n <= 7) {
            fmpq_set_si(k, known[n], 1);
            UNIT_CHECK(&rep, fmpq_equal(x, k), "v_%ld known value", (long) n);
        }
    }
    for (n = 0; n <= 12; n++)
        fmpq_clear(v + n);
    fmpq_clear(x);
    fmpq_clear(k);
}

int main(void)
{
    wk_table *T = wk_table_new();
    test_linear_volumes(T);
    test_v05(T);
    test_v12(T);
    test_v21(T);
    test_closed(T);
    test_zograf(T);
    wk_table_free(T);
    flint_cleanup();
    return unit_finish("test_published", &rep);
}
