/* test_series.c - unit tests of truncated power series (src/engines/series/tseries.h).
 *
 * Property tests (identities that must hold exactly, on random input with a fixed seed):
 * exp(log f) = f, log(exp f) = f, revert(revert f) = f, compose(f, revert f) = x, (a*b)/b = a,
 * d/dvar of the integral in var is the identity, f^a f^b = f^(a+b), f^e f^(-e) = 1.
 * They run on random rational series (FLINT fmpq_poly fast path) and on random series whose
 * coefficients are polynomials in two other variables and pi (generic path).  The generic path is
 * also forced on rational input through the test-only entry points tseries_generic_* of
 * series/tseries_internal.h, and must agree exactly with the fast path.
 * A few known series are checked as values (sources beside them), then every error code.
 */
#include <string.h>
#include <flint/fmpq_poly.h>
#include <flint/ulong_extras.h>
#include "series/tseries_internal.h"
#include "unit.h"

#define NVARS 128       /* the language's context: 128 variables, pi last */
#define X 0             /* main variable */
#define Y 1
#define Z 2
#define PI 127

static unit_report rep;
static flint_rand_t state;
static fmpq_mpoly_ctx_t ctx;
static const char *names[NVARS];   /* x, y, z, v3, ..., pi */
static char name_buf[NVARS][24];

/* 1 when a and b are the same series (var, order and polynomial).
   Used by every property test. */
static int ts_equal(const tseries *a, const tseries *b)
{
    return a->var == b->var && a->order == b->order && fmpq_mpoly_equal(a->p, b->p, ctx);
}

/* Prints a series to stderr after a failed check.
   Shows var, order and the polynomial in the variables x, y, z, ... */
static void ts_print(const char *label, const tseries *s)
{
    fprintf(stderr, "    %s (var %ld, order %ld) = ", label, (long) s->var, (long) s->order);
    fmpq_mpoly_fprint_pretty(stderr, s->p, names, ctx);
    fprintf(stderr, "\n");
}

/* A small random nonzero rational: numerator in [-9, 9] \ {0}, denominator in [1, 6].
   Uses the test's fixed-seed state. */
static void rand_fmpq_nonzero(fmpq_t c)
{
    slong num = (slong) n_randint(state, 18) - 9;
    fmpq_set_si(c, num >= 0 ? num + 1 : num, 1 + n_randint(state, 6));
}

/* A random coefficient polynomial: 0 (probability 1/4) or up to 3 terms y^a z^b pi^c with
   small exponents when multi, else a rational constant. */
static void rand_coeff(fmpq_mpoly_t c, int multi)
{
    ulong exp[NVARS];
    fmpq_t q;
    slong t, nterms = multi ? 1 + (slong) n_randint(state, 3) : 1;
    fmpq_init(q);
    fmpq_mpoly_zero(c, ctx);
    if (n_randint(state, 4) != 0)
        for (t = 0; t < nterms; t++) {
            memset(exp, 0, sizeof exp);
            if (multi) {
                exp[Y] = n_randint(state, 3);
                exp[Z] = n_randint(state, 2);
                exp[PI] = n_randint(state, 4) == 0;
            }
            rand_fmpq_nonzero(q);
            fmpq_mpoly_set_coeff_fmpq_ui(c, q, exp, ctx);
        }
    fmpq_clear(q);
}

/* s = random series of the given order, coefficients of x^lo..x^order random (lower ones 0);
   the x^0 coefficient, if lo = 0, is random too.  multi selects multivariate coefficients. */
static void rand_series(tseries *s, slong order, slong lo, int multi)
{
    slong i;
    tsvec v;
    tsvec_init(&v, order + 1, ctx);
    for (i = lo; i <= order; i++)
        rand_coeff(v.c + i, multi);
    tseries_set_tsvec(s, &v, X, order, ctx);
    tsvec_clear(&v, ctx);
}

/* Sets the x^n coefficient of s to the rational c (other coefficients kept).
   n must be <= s->order. */
static void set_coeff_q(tseries *s, slong n, const fmpq_t c)
{
    tsvec v;
    tsvec_init_series(&v, s, ctx);
    fmpq_mpoly_set_fmpq(v.c + n, c, ctx);
    tseries_set_tsvec(s, &v, s->var, s->order, ctx);
    tsvec_clear(&v, ctx);
}

/* Random order in [lo, hi].
   Uses the test's fixed-seed state. */
static slong rand_order(slong lo, slong hi)
{
    return lo + (slong) n_randint(state, (ulong) (hi - lo + 1));
}

/* Property test: exp(log f) = f and log(exp h) = h, h = f - 1.
   f has constant term 1. */
static void test_exp_log(int multi, slong maxord)
{
    tseries f, h, a, b;
    fmpq_t one;
    fmpq_init(one);
    fmpq_one(one);
    tseries_init(&f, X, 0, ctx), tseries_init(&h, X, 0, ctx);
    tseries_init(&a, X, 0, ctx), tseries_init(&b, X, 0, ctx);
    f.order = rand_order(0, maxord);
    rand_series(&f, f.order, 1, multi);
    tseries_set(&h, &f, ctx);                      /* h(0) = 0 */
    set_coeff_q(&f, 0, one);
    UNIT_CHECK(&rep, tseries_log(&a, &f, ctx) == TS_OK && tseries_exp(&b, &a, ctx) == TS_OK
               && ts_equal(&b, &f), "property exp(log f) = f (multi=%d)", multi);
    UNIT_CHECK(&rep, tseries_exp(&a, &h, ctx) == TS_OK && tseries_log(&b, &a, ctx) == TS_OK
               && ts_equal(&b, &h), "property log(exp h) = h (multi=%d)", multi);
    if (rep.failed)
        ts_print("f", &f), ts_print("b", &b);
    tseries_clear(&f, ctx), tseries_clear(&h, ctx), tseries_clear(&a, ctx), tseries_clear(&b, ctx);
    fmpq_clear(one);
}

/* f = random series with f(0) = 0 and a nonzero rational linear coefficient.
   Order at least 1. */
static void rand_invertible(tseries *f, slong maxord, int multi)
{
    fmpq_t c;
    fmpq_init(c);
    rand_series(f, rand_order(1, maxord), 2, multi);
    rand_fmpq_nonzero(c);
    set_coeff_q(f, 1, c);
    fmpq_clear(c);
}

/* Property test: revert(revert f) = f and compose(f, revert f) = x.
   f(0) = 0, f'(0) a nonzero rational. */
static void test_revert(int multi, slong maxord)
{
    tseries f, r, rr, c, x;
    tseries_init(&f, X, 0, ctx), tseries_init(&r, X, 0, ctx), tseries_init(&rr, X, 0, ctx);
    tseries_init(&c, X, 0, ctx), tseries_init(&x, X, 0, ctx);
    rand_invertible(&f, maxord, multi);
    x.order = f.order;
    fmpq_mpoly_gen(x.p, X, ctx);
    UNIT_CHECK(&rep, tseries_revert(&r, &f, ctx) == TS_OK && tseries_revert(&rr, &r, ctx) == TS_OK
               && ts_equal(&rr, &f), "property revert(revert f) = f (multi=%d)", multi);
    UNIT_CHECK(&rep, tseries_compose(&c, &f, &r, ctx) == TS_OK && ts_equal(&c, &x),
               "property compose(f, revert f) = x (multi=%d)", multi);
    UNIT_CHECK(&rep, tseries_compose(&c, &r, &f, ctx) == TS_OK && ts_equal(&c, &x),
               "property compose(revert f, f) = x (multi=%d)", multi);
    tseries_clear(&f, ctx), tseries_clear(&r, ctx), tseries_clear(&rr, ctx);
    tseries_clear(&c, ctx), tseries_clear(&x, ctx);
}

/* Property test: (a*b)/b = a for b with a nonzero rational constant term, and the product's
   order is the smaller order. */
static void test_mul_div(int multi, slong maxord)
{
    tseries a, b, p, q;
    fmpq_t c;
    slong order;
    fmpq_init(c);
    tseries_init(&a, X, 0, ctx), tseries_init(&b, X, 0, ctx);
    tseries_init(&p, X, 0, ctx), tseries_init(&q, X, 0, ctx);
    rand_series(&a, rand_order(0, maxord), 0, multi);
    rand_series(&b, rand_order(0, maxord), 0, multi);
    rand_fmpq_nonzero(c);
    set_coeff_q(&b, 0, c);
    order = FLINT_MIN(a.order, b.order);
    UNIT_CHECK(&rep, tseries_mul(&p, &a, &b, ctx) == TS_OK && p.order == order
               && tseries_div(&q, &p, &b, ctx) == TS_OK, "mul/div status (multi=%d)", multi);
    tseries_truncate(&a, order, ctx);
    UNIT_CHECK(&rep, ts_equal(&q, &a), "property (a*b)/b = a (multi=%d)", multi);
    tseries_mul(&q, &b, &a, ctx);
    UNIT_CHECK(&rep, ts_equal(&q, &p), "property a*b = b*a (multi=%d)", multi);
    tseries_mul(&a, &a, &b, ctx);                     /* aliased output */
    UNIT_CHECK(&rep, ts_equal(&a, &p), "aliased mul equals plain mul (multi=%d)", multi);
    tseries_clear(&a, ctx), tseries_clear(&b, ctx), tseries_clear(&p, ctx), tseries_clear(&q, ctx);
    fmpq_clear(c);
}

/* Property test: derivative of the integral is the identity (main variable and Y), with the
   documented order changes. */
static void test_deriv_integral(int multi, slong maxord)
{
    tseries f, i, d;
    tseries_init(&f, X, 0, ctx), tseries_init(&i, X, 0, ctx), tseries_init(&d, X, 0, ctx);
    rand_series(&f, rand_order(0, maxord), 0, multi);
    UNIT_CHECK(&rep, tseries_integral(&i, &f, X, ctx) == TS_OK && i.order == f.order + 1
               && tseries_derivative(&d, &i, X, ctx) == TS_OK && ts_equal(&d, &f),
               "property d/dx int dx f = f (multi=%d)", multi);
    UNIT_CHECK(&rep, tseries_integral(&i, &f, Y, ctx) == TS_OK && i.order == f.order
               && tseries_derivative(&d, &i, Y, ctx) == TS_OK && ts_equal(&d, &f),
               "property d/dy int dy f = f (multi=%d)", multi);
    tseries_clear(&f, ctx), tseries_clear(&i, ctx), tseries_clear(&d, ctx);
}

/* Property test: f^a f^b = f^(a+b) (a, b >= 0), f^e f^-e = 1, f^3 = f*f*f.
   f has a nonzero rational constant term. */
static void test_pow(int multi, slong maxord)
{
    tseries f, a, b, c, one;
    fmpq_t q;
    slong ea = (slong) n_randint(state, 5), eb = (slong) n_randint(state, 5);
    fmpq_init(q);
    tseries_init(&f, X, 0, ctx), tseries_init(&a, X, 0, ctx), tseries_init(&b, X, 0, ctx);
    tseries_init(&c, X, 0, ctx), tseries_init(&one, X, 0, ctx);
    rand_series(&f, rand_order(0, maxord), 0, multi);
    rand_fmpq_nonzero(q);
    set_coeff_q(&f, 0, q);
    tseries_pow_si(&a, &f, ea, ctx), tseries_pow_si(&b, &f, eb, ctx);
    tseries_mul(&a, &a, &b, ctx);
    tseries_pow_si(&c, &f, ea + eb, ctx);
    UNIT_CHECK(&rep, ts_equal(&a, &c), "property f^%ld f^%ld = f^%ld (multi=%d)", (long) ea,
               (long) eb, (long) (ea + eb), multi);
    tseries_pow_si(&a, &f, -ea - 1, ctx), tseries_pow_si(&b, &f, ea + 1, ctx);
    tseries_mul(&a, &a, &b, ctx);
    one.order = f.order;
    fmpq_mpoly_one(one.p, ctx);
    UNIT_CHECK(&rep, ts_equal(&a, &one), "property f^-e f^e = 1 (e=%ld, multi=%d)", (long) ea + 1,
               multi);
    tseries_mul(&a, &f, &f, ctx), tseries_mul(&a, &a, &f, ctx), tseries_pow_si(&b, &f, 3, ctx);
    UNIT_CHECK(&rep, ts_equal(&a, &b), "property f^3 = f*f*f (multi=%d)", multi);
    tseries_clear(&f, ctx), tseries_clear(&a, ctx), tseries_clear(&b, ctx);
    tseries_clear(&c, ctx), tseries_clear(&one, ctx);
    fmpq_clear(q);
}

/* Fast path vs generic path on the same rational input for every operation with a fast path.
   Both must give identical series (and identical status). */
static void test_fast_vs_generic(slong maxord)
{
    tseries a, b, f, r1, r2;
    fmpq_t q;
    slong e = (slong) n_randint(state, 7) - 3;
    fmpq_init(q);
    tseries_init(&a, X, 0, ctx), tseries_init(&b, X, 0, ctx), tseries_init(&f, X, 0, ctx);
    tseries_init(&r1, X, 0, ctx), tseries_init(&r2, X, 0, ctx);
    rand_series(&a, rand_order(0, maxord), 0, 0);
    rand_series(&b, rand_order(0, maxord), 0, 0);
    rand_fmpq_nonzero(q);
    set_coeff_q(&b, 0, q);
    rand_invertible(&f, maxord, 0);
    UNIT_CHECK(&rep, tseries_is_rational(&a, ctx) && tseries_is_rational(&b, ctx), "rational input");
#define AGREE(fast, gen, what)                                                          \
    UNIT_CHECK(&rep, (fast) == (gen) && ts_equal(&r1, &r2), "fast and generic %s agree", what)
    AGREE(tseries_mul(&r1, &a, &b, ctx), tseries_generic_mul(&r2, &a, &b, ctx), "mul");
    AGREE(tseries_div(&r1, &a, &b, ctx), tseries_generic_div(&r2, &a, &b, ctx), "div");
    AGREE(tseries_log(&r1, &b, ctx), tseries_generic_log(&r2, &b, ctx), "log (status)");
    fmpq_inv(q, q);
    tseries_scalar_mul_fmpq(&b, &b, q, ctx);   /* b(0) = 1 now */
    AGREE(tseries_log(&r1, &b, ctx), tseries_generic_log(&r2, &b, ctx), "log");
    AGREE(tseries_exp(&r1, &f, ctx), tseries_generic_exp(&r2, &f, ctx), "exp");
    AGREE(tseries_pow_si(&r1, &b, e, ctx), tseries_generic_pow_si(&r2, &b, e, ctx), "pow_si");
    AGREE(tseries_pow_si(&r1, &a, -1, ctx), tseries_generic_pow_si(&r2, &a, -1, ctx), "pow_si -1");
    AGREE(tseries_compose(&r1, &a, &f, ctx), tseries_generic_compose(&r2, &a, &f, ctx), "compose");
    AGREE(tseries_revert(&r1, &f, ctx), tseries_generic_revert(&r2, &f, ctx), "revert");
#undef AGREE
    tseries_clear(&a, ctx), tseries_clear(&b, ctx), tseries_clear(&f, ctx);
    tseries_clear(&r1, ctx), tseries_clear(&r2, ctx);
    fmpq_clear(q);
}

/* Checks that the x^n coefficient of s is the rational c, for n = 0..s->order.
   c is computed by the caller-supplied function of n. */
static void check_coeffs(const tseries *s, void (*expect)(fmpq_mpoly_t, slong), const char *what)
{
    slong n;
    int ok = 1;
    fmpq_mpoly_t c, e;
    fmpq_mpoly_init(c, ctx), fmpq_mpoly_init(e, ctx);
    for (n = 0; n <= s->order; n++) {
        tseries_coeff(c, s, n, ctx);
        expect(e, n);
        ok = ok && fmpq_mpoly_equal(c, e, ctx);
    }
    UNIT_CHECK(&rep, ok, "known series %s", what);
    fmpq_mpoly_clear(c, ctx), fmpq_mpoly_clear(e, ctx);
}

/* 1/n!, the coefficients of exp(x) (definition of exp).
   Used as expected coefficients by check_coeffs. */
static void expect_exp(fmpq_mpoly_t e, slong n)
{
    fmpz_t f;
    fmpq_t q;
    fmpz_init(f), fmpq_init(q);
    fmpz_fac_ui(f, (ulong) n);
    fmpq_set_fmpz(q, f);
    fmpq_inv(q, q);
    fmpq_mpoly_set_fmpq(e, q, ctx);
    fmpz_clear(f), fmpq_clear(q);
}

/* (-n)^(n-1)/n!, the coefficients of the Lambert W series, the inverse of x e^x (classical
   consequence of Lagrange inversion; from memory). */
static void expect_lambert(fmpq_mpoly_t e, slong n)
{
    fmpz_t num, den;
    fmpq_t q;
    fmpz_init(num), fmpz_init(den), fmpq_init(q);
    if (n > 0) {
        fmpz_set_si(num, -n);
        fmpz_pow_ui(num, num, (ulong) (n - 1));
        fmpz_fac_ui(den, (ulong) n);
        fmpq_set_fmpz_frac(q, num, den);
    }
    fmpq_mpoly_set_fmpq(e, q, ctx);
    fmpz_clear(num), fmpz_clear(den), fmpq_clear(q);
}

/* Catalan(n-1) y^(n-1): coefficients of (1 - sqrt(1 - 4yx))/(2y), the inverse of x - y x^2
   (classical generating function of the Catalan numbers binom(2m,m)/(m+1); from memory). */
static void expect_catalan(fmpq_mpoly_t e, slong n)
{
    ulong exp[NVARS] = {0};
    fmpq_t b;
    fmpq_init(b);
    fmpq_mpoly_zero(e, ctx);
    if (n > 0) {
        fmpz_bin_uiui(fmpq_numref(b), (ulong) (2 * n - 2), (ulong) (n - 1));
        fmpz_divexact_ui(fmpq_numref(b), fmpq_numref(b), (ulong) n);
        exp[Y] = (ulong) (n - 1);
        fmpq_mpoly_set_coeff_fmpq_ui(e, b, exp, ctx);
    }
    fmpq_clear(b);
}

/* y^n/n!, the coefficients of exp(y x).
   Used as expected coefficients by check_coeffs (generic path). */
static void expect_exp_y(fmpq_mpoly_t e, slong n)
{
    fmpq_mpoly_t y;
    fmpq_mpoly_init(y, ctx);
    expect_exp(e, n);
    fmpq_mpoly_gen(y, Y, ctx);
    fmpq_mpoly_pow_ui(y, y, (ulong) n, ctx);
    fmpq_mpoly_mul(e, e, y, ctx);
    fmpq_mpoly_clear(y, ctx);
}

/* Known series on both paths: exp(x), Lambert W, Catalan (multivariate), exp(yx).
   Expected values come from the expect_* functions above. */
static void test_known_values(void)
{
    tseries x, f, r;
    fmpq_mpoly_t p;
    const slong N = 20;
    fmpq_mpoly_init(p, ctx);
    tseries_init(&x, X, N, ctx), tseries_init(&f, X, N, ctx), tseries_init(&r, X, N, ctx);
    fmpq_mpoly_gen(x.p, X, ctx);
    tseries_exp(&r, &x, ctx);
    check_coeffs(&r, expect_exp, "exp(x) (fast path)");
    tseries_generic_exp(&r, &x, ctx);
    check_coeffs(&r, expect_exp, "exp(x) (generic path)");
    tseries_mul(&f, &x, &r, ctx);                           /* x e^x */
    tseries_revert(&r, &f, ctx);
    check_coeffs(&r, expect_lambert, "Lambert W (fast path)");
    tseries_generic_revert(&r, &f, ctx);
    check_coeffs(&r, expect_lambert, "Lambert W (generic path)");
    fmpq_mpoly_set_str_pretty(p, "x - y*x^2", names, ctx);
    tseries_set_mpoly(&f, p, ctx);
    UNIT_CHECK(&rep, tseries_revert(&r, &f, ctx) == TS_OK, "revert x - y x^2");
    check_coeffs(&r, expect_catalan, "Catalan inverse of x - y x^2");
    fmpq_mpoly_set_str_pretty(p, "y*x", names, ctx);
    tseries_set_mpoly(&f, p, ctx);
    tseries_exp(&r, &f, ctx);
    check_coeffs(&r, expect_exp_y, "exp(y x)");
    tseries_clear(&x, ctx), tseries_clear(&f, ctx), tseries_clear(&r, ctx);
    fmpq_mpoly_clear(p, ctx);
}

/* Access functions: truncation by set_mpoly, coeff outside the order, valuation, evaluation,
   derivative order at order 0, pow with a zero exponent. */
static void test_access(void)
{
    tseries s, r;
    fmpq_mpoly_t p, c, e;
    fmpq_t h;
    fmpq_mpoly_init(p, ctx), fmpq_mpoly_init(c, ctx), fmpq_mpoly_init(e, ctx);
    fmpq_init(h);
    tseries_init(&s, X, 3, ctx), tseries_init(&r, X, 3, ctx);
    fmpq_mpoly_set_str_pretty(p, "y*x^2 + 3*x^5 + x^4*y + 2*x^3", names, ctx);
    tseries_set_mpoly(&s, p, ctx);
    fmpq_mpoly_set_str_pretty(e, "y*x^2 + 2*x^3", names, ctx);
    UNIT_CHECK(&rep, fmpq_mpoly_equal(s.p, e, ctx), "set_mpoly truncates to order 3");
    UNIT_CHECK(&rep, tseries_valuation(&s, ctx) == 2, "valuation 2");
    tseries_coeff(c, &s, 5, ctx);
    UNIT_CHECK(&rep, fmpq_mpoly_is_zero(c, ctx), "coefficient beyond the order is 0");
    tseries_coeff(c, &s, 2, ctx);
    fmpq_mpoly_gen(e, Y, ctx);
    UNIT_CHECK(&rep, fmpq_mpoly_equal(c, e, ctx), "coefficient of x^2 is y");
    fmpq_set_si(h, 1, 2);
    fmpq_mpoly_set_str_pretty(e, "y/4 + 1/4", names, ctx);
    UNIT_CHECK(&rep, tseries_eval_fmpq(c, &s, h, ctx) == TS_OK && fmpq_mpoly_equal(c, e, ctx),
               "eval at x = 1/2");
    r.order = 0;
    fmpq_mpoly_one(r.p, ctx);
    UNIT_CHECK(&rep, tseries_derivative(&r, &r, X, ctx) == TS_OK && r.order == -1,
               "derivative of an order-0 series has order -1");
    UNIT_CHECK(&rep, tseries_pow_si(&r, &s, 0, ctx) == TS_OK && fmpq_mpoly_is_one(r.p, ctx)
               && r.order == 3, "f^0 = 1 even when f(0) = 0");
    tseries_clear(&s, ctx), tseries_clear(&r, ctx);
    fmpq_mpoly_clear(p, ctx), fmpq_mpoly_clear(c, ctx), fmpq_mpoly_clear(e, ctx);
    fmpq_clear(h);
}

/* Every error code, each on a minimal input.
   The result must be the error series (zero, order -1) each time. */
static void test_errors(void)
{
    tseries a, b, r, w;
    fmpq_mpoly_t p;
    fmpq_mpoly_init(p, ctx);
    tseries_init(&a, X, 4, ctx), tseries_init(&b, X, 4, ctx), tseries_init(&r, X, 4, ctx);
    tseries_init(&w, Y, 4, ctx);
#define SETP(s, str) (fmpq_mpoly_set_str_pretty(p, str, names, ctx), tseries_set_mpoly(s, p, ctx))
#define ERR(call, code, what) UNIT_CHECK(&rep, (call) == (code) && r.order == -1 \
                                         && fmpq_mpoly_is_zero(r.p, ctx), "error code: %s", what)
    SETP(&a, "1 + x");
    SETP(&b, "x + x^2");
    ERR(tseries_div(&r, &a, &b, ctx), TS_DIVZERO, "division by a series with zero constant");
    SETP(&b, "y + x");
    ERR(tseries_div(&r, &a, &b, ctx), TS_NOT_RATIONAL, "division by y + x");
    ERR(tseries_pow_si(&r, &b, -2, ctx), TS_NOT_RATIONAL, "(y + x)^-2");
    ERR(tseries_exp(&r, &b, ctx), TS_NEEDS_ZERO_CONSTANT, "exp(y + x)");
    ERR(tseries_generic_exp(&r, &a, ctx), TS_NEEDS_ZERO_CONSTANT, "generic exp(1 + x)");
    ERR(tseries_compose(&r, &a, &a, ctx), TS_NEEDS_ZERO_CONSTANT, "compose with g(0) = 1");
    ERR(tseries_revert(&r, &a, ctx), TS_NEEDS_ZERO_CONSTANT, "revert 1 + x");
    SETP(&b, "2 + x");
    ERR(tseries_log(&r, &b, ctx), TS_NEEDS_UNIT_CONSTANT, "log(2 + x)");
    SETP(&b, "x^2");
    ERR(tseries_pow_si(&r, &b, -1, ctx), TS_NEEDS_UNIT_CONSTANT, "(x^2)^-1");
    ERR(tseries_revert(&r, &b, ctx), TS_NEEDS_LINEAR_TERM, "revert x^2");
    ERR(tseries_generic_revert(&r, &b, ctx), TS_NEEDS_LINEAR_TERM, "generic revert x^2");
    SETP(&b, "y*x + x^2");
    ERR(tseries_revert(&r, &b, ctx), TS_NOT_RATIONAL, "revert y x + x^2");
    SETP(&w, "1 + y");
    ERR(tseries_add(&r, &a, &w, ctx), TS_VAR_MISMATCH, "add with different main variables");
    ERR(tseries_mul(&r, &a, &w, ctx), TS_VAR_MISMATCH, "mul with different main variables");
    ERR(tseries_compose(&r, &b, &w, ctx), TS_VAR_MISMATCH, "compose with different variables");
    ERR(tseries_derivative(&r, &a, NVARS, ctx), TS_BADARG, "derivative in a variable out of range");
    ERR(tseries_integral(&r, &a, -1, ctx), TS_BADARG, "integral in a variable out of range");
    SETP(&b, "3 + x");
    ERR(tseries_pow_si(&r, &b, WORD_MIN, ctx), TS_BADARG, "(3 + x)^WORD_MIN");
    SETP(&b, "1 + x");
    UNIT_CHECK(&rep, tseries_pow_si(&r, &b, WORD_MAX, ctx) == TS_OK && r.order == 4,
               "(1 + x)^WORD_MAX is accepted");
    tseries_clear(&w, ctx);
    tseries_init(&w, NVARS + 5, 2, ctx);
    ERR(tseries_exp(&r, &w, ctx), TS_BADARG, "series with an invalid variable");
    w.var = X, w.order = TSERIES_MAX_ORDER + 1;
    ERR(tseries_mul(&r, &w, &a, ctx), TS_BADARG, "order above TSERIES_MAX_ORDER");
    w.order = TSERIES_MAX_ORDER;
    ERR(tseries_integral(&r, &w, X, ctx), TS_BADARG, "integral beyond TSERIES_MAX_ORDER");
#undef ERR
#undef SETP
    tseries_clear(&a, ctx), tseries_clear(&b, ctx), tseries_clear(&r, ctx), tseries_clear(&w, ctx);
    fmpq_mpoly_clear(p, ctx);
}

/* Sets up the variable names x, y, z, v3, ..., pi used for parsing and failure output.
   Must run before any parsing or printing. */
static void names_init(void)
{
    slong i;
    for (i = 0; i < NVARS; i++) {
        snprintf(name_buf[i], sizeof name_buf[i], "v%ld", (long) i);
        names[i] = name_buf[i];
    }
    names[X] = "x", names[Y] = "y", names[Z] = "z", names[PI] = "pi";
}

/* Runs every test (randomised loops scaled by PSIKAPPA_TEST_MULTIPLIER).
   Exit status nonzero iff a check failed. */
int main(void)
{
    long i, iters = unit_iterations(40);
    flint_randinit(state);
    fmpq_mpoly_ctx_init(ctx, NVARS, ORD_DEGLEX);
    names_init();
    test_known_values();
    test_access();
    test_errors();
    for (i = 0; i < iters; i++) {
        test_exp_log(0, 25);
        test_exp_log(1, 10);
        test_revert(0, 25);
        test_revert(1, 8);
        test_mul_div(0, 25);
        test_mul_div(1, 8);
        test_deriv_integral(0, 25);
        test_deriv_integral(1, 8);
        test_pow(0, 20);
        test_pow(1, 5);
        test_fast_vs_generic(15);
    }
    fmpq_mpoly_ctx_clear(ctx);
    flint_randclear(state);
    flint_cleanup();
    return unit_finish("test_series", &rep);
}
