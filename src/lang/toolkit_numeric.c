/* Numerical builtins of the toolkit, all by Arb ball arithmetic: ball, the
   first zero of the Bessel function J_0, J_1, and the constant 2/(x_0 J_1(x_0)).
   Also the readers of exact numbers and decimal strings as balls that
   toolkit_recognise.c and toolkit_svg.c share. */
#include <ctype.h>
#include <errno.h>
#include <stdlib.h>

#include "arb_compat.h"
#include "builtins.h"
#include "scalar_arb.h"
#include "util.h"

#ifdef PSIKAPPA_FLINT3_ARB
#include <flint/arb_hypgeom.h>
#else
#include <arb_hypgeom.h>
#endif

#define TK_LOG2_10 3.321928094887362
#define TK_LOG10_2 0.3010299956639812
#define TK_MAX_DIGITS 100000   /* decimal(): same order; more would take minutes */

/* Checks the shape [-+]digits[.digits][(e|E)[-+]digits] and returns the
   exponent of the last written digit (value of one unit there is 10^ret);
   sets *ok to 0 on bad syntax or an exponent beyond +-10^6. */
static slong tk_decimal_last_place(const char *s, int *ok)
{
    slong frac = 0, ndig = 0, e = 0;
    *ok = 0;
    if (*s == '+' || *s == '-')
        s++;
    for (; isdigit((unsigned char)*s); s++)
        ndig++;
    if (*s == '.')
        for (s++; isdigit((unsigned char)*s); s++, frac++)
            ndig++;
    if (ndig == 0)
        return 0;
    if (*s == 'e' || *s == 'E') {
        char *end;
        errno = 0;
        long v = strtol(s + 1, &end, 10);
        if (end == s + 1 || errno || v > 1000000 || v < -1000000)
            return 0;
        e = v;
        s = end;
    }
    *ok = *s == '\0';
    return e - frac;
}

/* Reads a decimal string as a ball: the written value with a radius of one
   unit in its last digit (the digits of decimal() are correct to that), or
   Arb's own "[mid +/- rad]" form. Returns 0 on bad syntax. */
int toolkit_arb_of_decimal(arb_t r, const char *s, slong prec)
{
    if (s[0] == '[')
        return arb_set_str(r, s, prec) == 0;
    int ok;
    slong last = tk_decimal_last_place(s, &ok);
    if (!ok || arb_set_str(r, s, prec) != 0)
        return 0;
    arb_t u;
    arb_init(u);
    arb_set_ui(u, 10);
    arb_pow_ui(u, u, (ulong)(last < 0 ? -last : last), prec + 10);
    if (last < 0)
        arb_inv(u, u, prec + 10);
    arb_add_error(r, u);
    arb_clear(u);
    return 1;
}

/* Reads argument i as a real number: a number in Q[pi] (exact, evaluated
   at prec) or a decimal string. Returns 0 after reporting an error. */
static int tk_get_real(arb_t r, interp *I, const node *call, value **args, int i, slong prec)
{
    const value *v = args[i];
    if (v->kind == V_NUM && scalar_is_pi_only(v->num, &I->ring)) {
        scalar_get_arb(r, v->num, &I->ring, prec);
        return 1;
    }
    if (v->kind == V_STR && toolkit_arb_of_decimal(r, v->str, prec))
        return 1;
    builtin_fail_at(call, i,
                    v->kind == V_STR ? "expected a decimal number such as \"2.4048\" or \"1.5e-3\" in this string"
                                     : "expected a number in Q[pi] (no formal variables) or a decimal string");
    return 0;
}

/* A decimal string of x with `digits` significant digits (Arb's rounding),
   as a new value. x must be accurate to those digits. */
static value *tk_str_value(interp *I, const arb_t x, slong digits, ulong flags)
{
    char *t = arb_get_str(x, digits, flags);
    value *v = value_new_str(xstrdup(t), &I->ring);
    flint_free(t);
    return v;
}

/* 1 when x is known well enough to print `digits` correct digits. */
static int tk_accurate(const arb_t x, slong digits)
{
    return arb_is_exact(x) || arb_rel_accuracy_bits(x) >= (slong)(digits * TK_LOG2_10) + 10;
}

/* ball(x, d): x evaluated at about d digits of precision, printed by Arb
   with its radius, so the user sees how much of it is certain. */
value *toolkit_ball(interp *I, const node *call, value **args)
{
    slong digits;
    if (!builtin_get_slong(I, call, args, 1, 1, TK_MAX_DIGITS, &digits))
        return NULL;
    arb_t r;
    arb_init(r);
    value *v = NULL;
    if (tk_get_real(r, I, call, args, 0, (slong)(digits * TK_LOG2_10) + 8))
        v = tk_str_value(I, r, digits, 0);
    arb_clear(r);
    return v;
}

/* ---- Bessel functions ---- */

/* r = J_nu(z) for an integer order nu. */
static void tk_bessel_j(arb_t r, slong nu, const arb_t z, slong prec)
{
    arb_t n;
    arb_init(n);
    arb_set_si(n, nu);
    arb_hypgeom_bessel_j(r, n, z, prec);
    arb_clear(n);
}

/* 1 when J_0 is certified positive on [a, b] (doubles, taken exactly),
   bisecting up to `depth` times where one ball is too coarse. */
static int tk_j0_positive_on(double a, double b, int depth)
{
    arf_t lo, hi;
    arb_t x, y;
    arf_init(lo);
    arf_init(hi);
    arb_init(x);
    arb_init(y);
    arf_set_d(lo, a);
    arf_set_d(hi, b);
    arb_set_interval_arf(x, lo, hi, 64);
    tk_bessel_j(y, 0, x, 64);
    int ok = arb_is_positive(y);
    arf_clear(lo);
    arf_clear(hi);
    arb_clear(x);
    arb_clear(y);
    if (ok || depth == 0)
        return ok;
    double m = (a + b) / 2;
    return tk_j0_positive_on(a, m, depth - 1) && tk_j0_positive_on(m, b, depth - 1);
}

/* The bracket of the first zero: J_0 > 0 on [0, TK_J0_LO] is certified,
   and interval Newton starts on [TK_J0_LO, TK_J0_HI]. */
#define TK_J0_LO 2.40
#define TK_J0_HI 2.41

/* One interval Newton step N = m - J_0(m)/J_0'(X) = m + J_0(m)/J_1(X),
   X <- X cap N. Returns 0 when the step cannot be certified. `first` also
   requires N inside X, which proves a zero in X (unique: J_1 > 0 there). */
static int tk_j0_newton_step(arb_t X, int first, slong prec)
{
    arb_t m, f, d, N;
    arb_init(m);
    arb_init(f);
    arb_init(d);
    arb_init(N);
    arb_get_mid_arb(m, X);
    tk_bessel_j(f, 0, m, prec);
    tk_bessel_j(d, 1, X, prec);
    int ok = arb_is_positive(d);
    if (ok) {
        arb_div(N, f, d, prec);
        arb_add(N, N, m, prec);
        ok = (!first || arb_contains(X, N)) && arb_intersection(X, X, N, prec);
    }
    arb_clear(m);
    arb_clear(f);
    arb_clear(d);
    arb_clear(N);
    return ok;
}

/* X = a ball of relative accuracy >= goal bits around the first positive
   zero of J_0. Returns 0 if some certification step fails (it should not). */
static int tk_j0_zero_ball(arb_t X, slong goal)
{
    arf_t lo, hi;
    arf_init(lo);
    arf_init(hi);
    arf_set_d(lo, TK_J0_LO);
    arf_set_d(hi, TK_J0_HI);
    arb_set_interval_arf(X, lo, hi, 64);
    arf_clear(lo);
    arf_clear(hi);
    if (!tk_j0_positive_on(0.0, TK_J0_LO, 20))
        return 0;
    slong prec = 64;
    for (int it = 0; it < 200; it++) {
        if (!tk_j0_newton_step(X, it == 0, prec))
            return 0;
        if (arb_rel_accuracy_bits(X) >= goal)
            return 1;
        prec = FLINT_MIN(2 * prec, goal + 64);
    }
    return 0;
}

/* bessel_j0_zero(d): x_0 = 2.404825557695... to d significant digits. */
value *toolkit_j0_zero(interp *I, const node *call, value **args)
{
    slong digits;
    if (!builtin_get_slong(I, call, args, 0, 1, TK_MAX_DIGITS / 10, &digits))
        return NULL;
    arb_t X;
    arb_init(X);
    value *v = tk_j0_zero_ball(X, (slong)(digits * TK_LOG2_10) + 20) ? tk_str_value(I, X, digits, ARB_STR_NO_RADIUS)
                                                                       : builtin_fail_at(call, -1, "could not certify the zero of J_0");
    arb_clear(X);
    return v;
}

/* bessel_j1(x, d): J_1(x) to d correct digits. A decimal string x limits
   the accuracy; then the error says how many digits x supports. */
value *toolkit_j1(interp *I, const node *call, value **args)
{
    slong digits;
    if (!builtin_get_slong(I, call, args, 1, 1, TK_MAX_DIGITS / 10, &digits))
        return NULL;
    slong want = (slong)(digits * TK_LOG2_10) + 10;
    arb_t x, y;
    arb_init(x);
    arb_init(y);
    value *v = NULL;
    int read = 1;
    for (slong prec = want + 30; !v && read && prec <= 8 * want + 4096; prec *= 2) {
        read = tk_get_real(x, I, call, args, 0, prec);
        if (read)
            tk_bessel_j(y, 1, x, prec);
        if (read && tk_accurate(y, digits))
            v = tk_str_value(I, y, digits, ARB_STR_NO_RADIUS);
    }
    if (!v && read) {
        slong known = arb_is_finite(y) ? FLINT_MAX(0, (slong)(arb_rel_accuracy_bits(y) * TK_LOG10_2)) : 0;
        char *msg = xasprintf("J_1(x) is known to only about %ld digits here (is x huge, or given to too few digits?)",
                              (long)known);
        builtin_fail_at(call, 0, msg);
        free(msg);
    }
    arb_clear(x);
    arb_clear(y);
    return v;
}

/* mz_constant(d): 2/(x_0 J_1(x_0)) = -2/(x_0 J_0'(x_0)), x_0 the first zero
   of J_0, to d digits: the growth constant of the volumes in fixed genus (Manin-Zograf
   2000; docs/asymptotics.md checks it against the genus-0 volumes). */
value *toolkit_mz_constant(interp *I, const node *call, value **args)
{
    slong digits;
    if (!builtin_get_slong(I, call, args, 0, 1, TK_MAX_DIGITS / 10, &digits))
        return NULL;
    arb_t X, C;
    arb_init(X);
    arb_init(C);
    value *v = NULL;
    int ok = 1;
    /* the accuracy of C follows that of x_0, so this ends after a step or two */
    for (slong goal = (slong)(digits * TK_LOG2_10) + 40; ok && !v && goal < 64 * TK_MAX_DIGITS; goal *= 2) {
        ok = tk_j0_zero_ball(X, goal);
        tk_bessel_j(C, 1, X, goal + 20);
        arb_mul(C, C, X, goal + 20);
        arb_ui_div(C, 2, C, goal + 20);
        if (ok && tk_accurate(C, digits))
            v = tk_str_value(I, C, digits, ARB_STR_NO_RADIUS);
    }
    if (!v)
        builtin_fail_at(call, -1, "could not certify 2/(x_0 J_1(x_0)) to the digits asked for");
    arb_clear(X);
    arb_clear(C);
    return v;
}
