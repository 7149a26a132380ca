/* test_theta_superrec.c - the super volumes V^Theta_{g,n}(L) of src/engines/theta/theta_volume.c against a
 * Mirzakhani-type recursion with the kernel of super hyperbolic geometry (property test; the
 * recursion is quoted from memory after D. Stanford, E. Witten, "JT gravity and the ensembles of
 * random matrix theory", 2019, and P. Norbury, "Enumerative geometry via the moduli space of super
 * Riemann surfaces", 2020, with the sign convention of docs/conventions.md):
 *
 *   b V_{g,1}(b) = 1/2 int_0^oo int_0^oo x y H(x + y, b) [ V_{g-1,2}(x, y) + sum_{g1+g2=g} V_{g1,1}(x) V_{g2,1}(y) ] dx dy
 *   b_1 V_{1,n+1}(b_1, B) = sum_k int_0^oo x R(b_1, x, b_k) V_{1,n}(x, B \ b_k) dx        (genus one)
 *   H(x, y) = 1/(4 pi) [ 1/cosh((x-y)/4) - 1/cosh((x+y)/4) ],  R(b, x, c) = (H(x, b+c) + H(x, b-c))/2.
 *
 * The moments of H are exact: int_0^oo x^m H(x, y) dx = sum_{j odd} C(m, j) 4^i |E_{2i}| pi^{2i} y^j
 * (m odd, i = (m-j)/2, E the Euler numbers), from int_0^oo u^{2i} / cosh(u/4) du = 2 4^i |E_{2i}|
 * pi^{2i+1}; the test confirms that integral by a quadrature for i <= 3.  Genus-zero super volumes
 * vanish (Theta_{0,n} = 0), so V_{1,1} = 1/8 is the only base value.  The recursion then rebuilds
 * V_{g,1} for g <= 7 from the engine's V_{g-1,2} and V_{h,1}, and V_{1,n} from V_{1,n-1}: every
 * coefficient must agree.  This fixes the normalisation stated in docs/conventions.md.
 * Also the dilaton-type identity V^Theta_{g,n+1}(L, 2 pi i) = (2g-2+n) V^Theta_{g,n}(L) (property
 * test, see check_dilaton).
 */
#include <math.h>
#include <flint/arith.h>
#include <flint/fmpq.h>
#include <flint/fmpq_vec.h>
#include <flint/fmpz.h>
#include "theta/theta.h"
#include "unit.h"

#define GMAX 7

static unit_report rep;
static theta_table *VT;

/* |E_{2i}| 4^i: the factor of pi^{2i} y^j in the moments of H. */
static void euler_factor(fmpz_t r, slong i)
{
    arith_euler_number(r, (ulong) (2 * i));
    fmpz_abs(r, r);
    fmpz_mul_2exp(r, r, (ulong) (2 * i));
}

/* Engine coefficient of prod x_i^{2 d_i} pi^{2k} in V^Theta_{g,n}, k = g-1-sum d:
   c_d 2^k / prod (2^{d_i} d_i!), c_d = theta_volume_coeff. */
static void vol_coeff(fmpq_t r, slong g, const slong *d, slong n)
{
    slong k = g - 1, i;
    fmpz_t f;
    fmpz_init(f);
    theta_volume_coeff(r, VT, g, d, n);
    for (i = 0; i < n; i++) {
        k -= d[i];
        fmpz_fac_ui(f, (ulong) d[i]);
        fmpq_div_fmpz(r, r, f);
        fmpq_div_2exp(r, r, (ulong) d[i]);
    }
    fmpq_mul_2exp(r, r, (ulong) k);
    fmpz_clear(f);
}

/* out[e] += w * (coefficient of b^{2e} in P_m(b)/b), m odd, P_m(b) = int_0^oo s^m H(s, b) ds;
   the pi power is implied by homogeneity. */
static void add_moment_over_b(fmpq *out, slong m, const fmpq_t w)
{
    fmpz_t c, e;
    fmpq_t t;
    fmpz_init(c);
    fmpz_init(e);
    fmpq_init(t);
    for (slong j = 1; j <= m; j += 2) {
        fmpz_bin_uiui(c, (ulong) m, (ulong) j);
        euler_factor(e, (m - j) / 2);
        fmpz_mul(c, c, e);
        fmpq_mul_fmpz(t, w, c);
        fmpq_add(out + (j - 1) / 2, out + (j - 1) / 2, t);
    }
    fmpz_clear(c);
    fmpz_clear(e);
    fmpq_clear(t);
}

/* out[e] += 1/2 v (2a+1)!(2c+1)!/(2a+2c+3)! P_{2a+2c+3}(b)/b: one monomial x^{2a} y^{2c} of the
   bracket, integrated against x y H(x+y, b) (Beta integral in s = x + y). */
static void add_pair(fmpq *out, slong a, slong c, const fmpq_t v)
{
    fmpz_t f;
    fmpq_t w;
    fmpz_init(f);
    fmpq_init(w);
    fmpz_fac_ui(f, (ulong) (2 * a + 1));
    fmpq_mul_fmpz(w, v, f);
    fmpz_fac_ui(f, (ulong) (2 * c + 1));
    fmpq_mul_fmpz(w, w, f);
    fmpz_fac_ui(f, (ulong) (2 * a + 2 * c + 3));
    fmpq_div_fmpz(w, w, f);
    fmpq_div_2exp(w, w, 1);
    add_moment_over_b(out, 2 * a + 2 * c + 3, w);
    fmpz_clear(f);
    fmpq_clear(w);
}

/* V_{g,1} by the recursion from the engine's lower volumes, against the engine's V_{g,1}. */
static void check_one_boundary(slong g)
{
    fmpq *out = _fmpq_vec_init(g);
    fmpq_t v, u;
    slong d[2], a, c, h;
    fmpq_init(v);
    fmpq_init(u);
    for (a = 0; a <= g - 2; a++)                     /* V_{g-1,2}(x, y) */
        for (c = 0; a + c <= g - 2; c++) {
            d[0] = a, d[1] = c;
            vol_coeff(v, g - 1, d, 2);
            add_pair(out, a, c, v);
        }
    for (h = 1; h <= g - 1; h++)                     /* V_{h,1}(x) V_{g-h,1}(y) */
        for (a = 0; a <= h - 1; a++)
            for (c = 0; c <= g - h - 1; c++) {
                vol_coeff(v, h, &a, 1);
                vol_coeff(u, g - h, &c, 1);
                fmpq_mul(v, v, u);
                add_pair(out, a, c, v);
            }
    int ok = 1;
    for (a = 0; a <= g - 1; a++) {
        vol_coeff(v, g, &a, 1);
        ok = ok && fmpq_equal(v, out + a);
    }
    UNIT_CHECK(&rep, ok, "V^Theta_{%ld,1}(b) by the super recursion", (long) g);
    fmpq_clear(v);
    fmpq_clear(u);
    _fmpq_vec_clear(out, g);
}

/* Genus one: int_0^oo x R(b, x, c) dx = b (the moment P_1 at b+c and b-c, averaged), so the
   recursion says V_{1,n+1} = n V_{1,n} for these constant polynomials. */
static void check_genus_one(void)
{
    slong d[8] = {0, 0, 0, 0, 0, 0, 0, 0};
    fmpq_t v, w, one;
    fmpq *p = _fmpq_vec_init(1);
    fmpq_init(v);
    fmpq_init(w);
    fmpq_init(one);
    fmpq_one(one);
    add_moment_over_b(p, 1, one);                    /* P_1(y)/y = 1 */
    for (slong n = 1; n <= 6; n++) {
        vol_coeff(v, 1, d, n);
        fmpq_mul_si(v, v, n);
        fmpq_mul(v, v, p);
        vol_coeff(w, 1, d, n + 1);
        UNIT_CHECK(&rep, fmpq_equal(v, w), "V^Theta_{1,%ld} by the genus-one recursion", (long) (n + 1));
    }
    vol_coeff(v, 1, d, 1);
    fmpq_set_si(w, 1, 8);
    UNIT_CHECK(&rep, fmpq_equal(v, w), "base value V^Theta_{1,1} = 1/8 (int_{Mbar_{1,1}} Theta)");
    fmpq_clear(v);
    fmpq_clear(w);
    fmpq_clear(one);
    _fmpq_vec_clear(p, 1);
}

/* int_0^oo u^{2i} / cosh(u/4) du by the trapezoid rule against 2 4^i |E_{2i}| pi^{2i+1}. */
static void check_moments(void)
{
    for (slong i = 0; i <= 3; i++) {
        double h = 1e-3, sum = i == 0 ? 0.5 : 0;   /* the end point u = 0, weight 1/2 */
        for (double u = h; u < 400; u += h)
            sum += pow(u, (double) (2 * i)) / cosh(u / 4);
        sum *= h;
        fmpz_t e;
        fmpz_init(e);
        euler_factor(e, i);
        double want = 2 * fmpz_get_d(e) * pow(M_PI, (double) (2 * i + 1));
        UNIT_CHECK(&rep, fabs(sum - want) < 1e-6 * want, "moment i = %ld: quadrature %.10g, formula %.10g", (long) i,
                   sum, want);
        fmpz_clear(e);
    }
}

/* Dilaton-type identity (property test, derived from Theta_{g,n+1} = psi_{n+1} pi^* Theta_{g,n}
   and kappa_1 = pi^* kappa_1 + psi_{n+1}: at L_{n+1} = 2 pi i the exponent is pulled back, and
   pi_* psi_{n+1} = 2g-2+n):  V^Theta_{g,n+1}(L, 2 pi i) = (2g-2+n) V^Theta_{g,n}(L).  With
   L_{n+1}^2 = -4 pi^2 every monomial prod x_i^{2 d_i} keeps its pi power by homogeneity. */
static void check_dilaton(slong g, slong n)
{
    slong d[8], e, i, total = 0;
    int ok = 1;
    fmpq_t lhs, t, rhs;
    fmpz_t p;
    fmpq_init(lhs);
    fmpq_init(t);
    fmpq_init(rhs);
    fmpz_init(p);
    for (slong code = 0; ok; code++) {     /* every d in [0, g-1]^n with sum <= g-1, by its digits */
        slong c = code, sum = 0;
        for (i = 0; i < n; i++, c /= g)
            d[i] = c % g, sum += d[i];
        if (c > 0)
            break;
        if (sum > g - 1)
            continue;
        fmpq_zero(lhs);
        for (e = 0; sum + e <= g - 1; e++) {
            d[n] = e;
            vol_coeff(t, g, d, n + 1);
            fmpz_set_si(p, -4);
            fmpz_pow_ui(p, p, (ulong) e);
            fmpq_mul_fmpz(t, t, p);
            fmpq_add(lhs, lhs, t);
        }
        vol_coeff(rhs, g, d, n);
        fmpq_mul_si(rhs, rhs, 2 * g - 2 + n);
        ok = fmpq_equal(lhs, rhs);
        total++;
    }
    UNIT_CHECK(&rep, ok && total > 0, "V^Theta_{%ld,%ld}(L, 2 pi i) = (2g-2+n) V^Theta_{%ld,%ld}(L)", (long) (g),
               (long) (n + 1), (long) g, (long) n);
    fmpq_clear(lhs);
    fmpq_clear(t);
    fmpq_clear(rhs);
    fmpz_clear(p);
}

int main(void)
{
    VT = theta_table_new(THETA_ROUTE_VIRASORO);
    check_moments();
    check_genus_one();
    for (slong g = 2; g <= GMAX; g++)
        check_one_boundary(g);
    for (slong g = 2; g <= 8; g++)
        for (slong n = 1; n <= 3; n++)
            check_dilaton(g, n);
    theta_table_free(VT);
    flint_cleanup();
    return unit_finish("test_theta_superrec", &rep);
}
