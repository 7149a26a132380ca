#include "real_funcs.h"

#include <stdlib.h>
#include <flint/arith.h>

#include "diag.h"
#include "scalar_arb.h"
#include "util.h"

#ifdef PSIKAPPA_FLINT3_ARB
#include <flint/arb_hypgeom.h>
#else
#include <arb_hypgeom.h>
#endif

#define RF_LOG2_10 3.3219280948873623
#define RF_MAX_GAMMA_EXACT 100000   /* gamma(n) = (n-1)! exactly up to here, a real beyond */
#define RF_MAX_ZETA_EXACT 100000    /* zeta(2k), zeta(-k) exactly up to here */

static const char *const rf_names[] = {"exp", "log", "sqrt", "sin", "cos", "sinh", "cosh", "gamma", "zeta"};

slong real_work_prec(const interp *I)
{
    return (slong)((double)I->real_digits * RF_LOG2_10) + 32;
}

int real_applies(const interp *I, const value *v)
{
    return v->kind == V_REAL || (v->kind == V_NUM && scalar_is_pi_only(v->num, &I->ring));
}

int real_get_ball(interp *I, const node *at, arb_t r, const value *v, slong prec, const char *fname)
{
    if (v->kind == V_REAL) {
        arb_set(r, v->re);
        return 1;
    }
    if (v->kind == V_NUM && scalar_is_pi_only(v->num, &I->ring)) {
        scalar_get_arb(r, v->num, &I->ring, prec);
        return 1;
    }
    if (v->kind == V_NUM)
        diag_error(&at->loc, "%s() of a polynomial in formal variables has no numerical value (substitute numbers "
                   "for the variables first, with subs)", fname);
    else
        diag_error(&at->loc, "%s() takes a number or a real, got a %s", fname, value_kind_name(v));
    return 0;
}

/* The precision for a function of v: the working one, or more when v is a
   real known more accurately. */
static slong rf_prec(const interp *I, const value *v)
{
    slong p = real_work_prec(I);
    if (v->kind == V_REAL && !arb_is_exact(v->re) && arb_rel_accuracy_bits(v->re) + 32 > p)
        p = arb_rel_accuracy_bits(v->re) + 32;
    return p;
}

/* sqrt of c * pi^(2k) with c the square of a rational: exact; 0 otherwise. */
static int rf_sqrt_exact(interp *I, fmpq_mpoly_t r, const fmpq_mpoly_t p)
{
    if (fmpq_mpoly_length(p, I->ring.ctx) != 1)
        return fmpq_mpoly_is_zero(p, I->ring.ctx) ? (fmpq_mpoly_zero(r, I->ring.ctx), 1) : 0;
    ulong exp[SCALAR_MAX_VARS];
    fmpq_t c;
    fmpq_init(c);
    fmpq_mpoly_get_term_exp_ui(exp, p, 0, I->ring.ctx);
    fmpq_mpoly_get_term_coeff_fmpq(c, p, 0, I->ring.ctx);
    int ok = fmpq_sgn(c) > 0 && fmpz_is_square(fmpq_numref(c)) && fmpz_is_square(fmpq_denref(c))
             && exp[SCALAR_PI] % 2 == 0 && exp[SCALAR_PINV] % 2 == 0;
    if (ok) {
        fmpz_sqrt(fmpq_numref(c), fmpq_numref(c));
        fmpz_sqrt(fmpq_denref(c), fmpq_denref(c));
        exp[SCALAR_PI] /= 2;
        exp[SCALAR_PINV] /= 2;
        fmpq_mpoly_zero(r, I->ring.ctx);
        fmpq_mpoly_set_coeff_fmpq_ui(r, c, exp, I->ring.ctx);
    }
    fmpq_clear(c);
    return ok;
}

/* zeta(s) for an integer s != 1 where it is in the ring: s = 2k > 0 gives
   (-1)^(k+1) B_2k (2 pi)^2k / (2 (2k)!), s = -m <= 0 gives (-1)^m B_(m+1)/(m+1)
   (so zeta(0) = -1/2). Returns 0 for odd s > 1 (no closed form). */
static int rf_zeta_exact(interp *I, fmpq_mpoly_t r, slong s)
{
    if ((s > 1 && s % 2) || s > RF_MAX_ZETA_EXACT || s < -RF_MAX_ZETA_EXACT)
        return 0;
    fmpq_t b;
    fmpq_init(b);
    ulong exp[SCALAR_MAX_VARS] = {0};
    if (s > 0) {
        fmpz_t f;
        fmpz_init(f);
        arith_bernoulli_number(b, (ulong)s);
        fmpz_fac_ui(f, (ulong)s);
        fmpq_mul_2exp(b, b, (ulong)s - 1);   /* (2 pi)^s / 2 = 2^(s-1) pi^s */
        fmpq_div_fmpz(b, b, f);
        if ((s / 2) % 2 == 0)
            fmpq_neg(b, b);
        exp[SCALAR_PI] = (ulong)s;
        fmpz_clear(f);
    } else {
        slong m = -s;
        arith_bernoulli_number(b, (ulong)(m + 1));
        fmpz_t d;
        fmpz_init_set_si(d, m + 1);
        fmpq_div_fmpz(b, b, d);   /* FLINT's B_1 = -1/2, so zeta(0) = -1/2 needs no exception */
        fmpz_clear(d);
        if (m % 2)
            fmpq_neg(b, b);
    }
    fmpq_mpoly_zero(r, I->ring.ctx);
    fmpq_mpoly_set_coeff_fmpq_ui(r, b, exp, I->ring.ctx);
    fmpq_clear(b);
    return 1;
}

/* The exact value of f at the exact number p, when the ring holds it; 0 when
   it does not (the caller then computes a ball) or, with *err set, when f
   has a pole there. */
static int rf_exact(interp *I, fmpq_mpoly_t r, int f, const fmpq_mpoly_t p, const char **err)
{
    slong n;
    int zero = fmpq_mpoly_is_zero(p, I->ring.ctx), one = fmpq_mpoly_is_one(p, I->ring.ctx);
    int integer = scalar_get_slong(&n, p, &I->ring);
    *err = NULL;
    if (zero && f != RF_LOG && f != RF_GAMMA && f != RF_ZETA) {
        fmpq_mpoly_set_si(r, f == RF_EXP || f == RF_COS || f == RF_COSH, I->ring.ctx);
        return 1;
    }
    if (f == RF_LOG && one) {
        fmpq_mpoly_zero(r, I->ring.ctx);
        return 1;
    }
    if (f == RF_SQRT)
        return rf_sqrt_exact(I, r, p);
    if (f == RF_GAMMA && integer && n <= 0)
        *err = "gamma() has a pole at 0, -1, -2, ...";
    if (f == RF_ZETA && integer && n == 1)
        *err = "zeta() has a pole at 1";
    if (*err)
        return 0;
    if (f == RF_GAMMA && integer && n <= RF_MAX_GAMMA_EXACT) {
        fmpz_t t;
        fmpz_init(t);
        fmpz_fac_ui(t, (ulong)(n - 1));
        fmpq_mpoly_set_fmpz(r, t, I->ring.ctx);
        fmpz_clear(t);
        return 1;
    }
    return f == RF_ZETA && integer && rf_zeta_exact(I, r, n);
}

/* Why f has no real value at the ball x (NULL when it has one). */
static const char *rf_domain_problem(int f, const arb_t x)
{
    if (f == RF_LOG && !arb_is_positive(x))
        return arb_is_nonpositive(x) ? "log() of a number <= 0 has no real value"
                                     : "log() of a real whose ball reaches 0 or below (raise the precision)";
    if (f == RF_SQRT && !arb_is_nonnegative(x))
        return arb_is_negative(x) ? "sqrt() of a negative number has no real value"
                                  : "sqrt() of a real whose ball reaches below 0 (raise the precision)";
    if (f == RF_ZETA && arb_contains_si(x, 1))
        return "zeta() has a pole at 1 (this ball contains 1)";
    return NULL;
}

static void rf_eval(arb_t r, int f, const arb_t x, slong prec)
{
    switch (f) {
    case RF_EXP: arb_exp(r, x, prec); break;
    case RF_LOG: arb_log(r, x, prec); break;
    case RF_SQRT: arb_sqrtpos(r, x, prec); break;
    case RF_SIN: arb_sin(r, x, prec); break;
    case RF_COS: arb_cos(r, x, prec); break;
    case RF_SINH: arb_sinh(r, x, prec); break;
    case RF_COSH: arb_cosh(r, x, prec); break;
    case RF_GAMMA: arb_hypgeom_gamma(r, x, prec); break;
    default: arb_zeta(r, x, prec); break;
    }
}

/* Wraps a computed ball; a ball that is not finite (a pole, an overflow) is an error. */
static value *rf_result(interp *I, const node *call, const arb_t y, const char *fname)
{
    if (!arb_is_finite(y)) {
        diag_error(&call->loc, "%s() has no finite value here (a pole, or a ball too wide: raise the precision)",
                   fname);
        return NULL;
    }
    value *r = value_new_real(&I->ring);
    arb_set(r->re, y);
    return r;
}

value *real_unary(interp *I, const node *call, int f, const value *x)
{
    const char *name = rf_names[f], *err = NULL;
    const node *at = call->list->len > 0 ? call->list->items[0] : call;
    if (x->kind == V_NUM && scalar_is_pi_only(x->num, &I->ring)) {
        value *e = value_new_num(&I->ring);
        if (rf_exact(I, e->num, f, x->num, &err))
            return e;
        value_release(e);
        if (err) {
            diag_error(&at->loc, "%s", err);
            return NULL;
        }
    }
    slong prec = rf_prec(I, x);
    arb_t a, y;
    arb_init(a);
    arb_init(y);
    value *r = NULL;
    if (real_get_ball(I, at, a, x, prec, name)) {
        err = rf_domain_problem(f, a);
        if (err)
            diag_error(&at->loc, "%s", err);
        else {
            rf_eval(y, f, a, prec);
            r = rf_result(I, call, y, name);
        }
    }
    arb_clear(a);
    arb_clear(y);
    return r;
}

static value *rf_sqrt(interp *I, const node *call, value **args) { return real_unary(I, call, RF_SQRT, args[0]); }
static value *rf_gamma(interp *I, const node *call, value **args) { return real_unary(I, call, RF_GAMMA, args[0]); }
static value *rf_zeta(interp *I, const node *call, value **args) { return real_unary(I, call, RF_ZETA, args[0]); }

/* besselj(nu, x) = J_nu(x); for x < 0 the order must be an integer (else the value is not real). */
static value *rf_besselj(interp *I, const node *call, value **args)
{
    slong prec = rf_prec(I, args[0]);
    if (rf_prec(I, args[1]) > prec)
        prec = rf_prec(I, args[1]);
    arb_t nu, x, y;
    arb_init(nu);
    arb_init(x);
    arb_init(y);
    value *r = NULL;
    if (real_get_ball(I, call->list->items[0], nu, args[0], prec, "besselj")
        && real_get_ball(I, call->list->items[1], x, args[1], prec, "besselj")) {
        if (!arb_is_nonnegative(x) && !arb_is_int(nu))
            diag_error(&call->list->items[1]->loc, "besselj(nu, x) for x that may be negative needs an integer "
                       "order nu (J_nu(x) is not real otherwise)");
        else {
            arb_hypgeom_bessel_j(y, nu, x, prec);
            r = rf_result(I, call, y, "besselj");
        }
    }
    arb_clear(nu);
    arb_clear(x);
    arb_clear(y);
    return r;
}

/* numeric(x): x (a number in pi, or a real) as a real at the working precision. */
static value *rf_numeric(interp *I, const node *call, value **args)
{
    if (args[0]->kind == V_REAL)
        return value_ref(args[0]);
    value *r = value_new_real(&I->ring);
    if (real_get_ball(I, call->list->items[0], r->re, args[0], real_work_prec(I), "numeric"))
        return r;
    value_release(r);
    return NULL;
}

const builtin builtins_real[] = {
    {"sqrt", 1, rf_sqrt, "sqrt(x): exact for squares (times even powers of pi), else a real"},
    {"gamma", 1, rf_gamma, "gamma(x): (x-1)! for integers, else a real"},
    {"zeta", 1, rf_zeta, "zeta(s): exact at even s > 0 and s <= 0, else a real"},
    {"besselj", 2, rf_besselj, "besselj(nu, x): the Bessel function J_nu(x), a real"},
    {"numeric", 1, rf_numeric, "numeric(x): x as a real at the working precision (precision D)"},
    {NULL, 0, NULL, NULL},
};
