/* tseries.h - truncated power series in one main variable x with coefficients in Q[other vars].
 *
 * A tseries stands for  p + O(x^(order+1)),  where x is the variable of index `var` of an
 * fmpq_mpoly context (the language's single scalar context: variables are plain indices) and p is
 * an fmpq_mpoly with deg_x(p) <= order.  The coefficients of x^n are polynomials in the other
 * variables of the context (formal variables, pi).  order = -1 means "nothing known" (p = 0).
 *
 * Fast path: when every operand involves x only (all coefficients are rational numbers) the
 * operations convert to fmpq_poly and use FLINT's series functions (mullow, div_series,
 * exp_series, log_series, compose_series, revert_series, pow_trunc, inv_series).  Otherwise
 * generic O(N^2) coefficient recurrences (O(N^3) for composition, reversion) on the coefficient
 * vectors are used; both give identical results (see tests/unit/test_series.c).
 *
 * Ownership: a tseries owns its polynomial; every tseries_init is paired with tseries_clear.
 * Result arguments must be initialised by the caller and may alias any input.  The context is
 * only read and must outlive every series built in it; no function keeps pointers to arguments.
 *
 * Error policy: no function aborts on bad input.  Operations return TS_OK or an error code and
 * then leave the result as zero with order -1 (its var set to the first operand's var).
 * Preconditions checked (TS_BADARG): var in [0, nvars), -1 <= order <= TSERIES_MAX_ORDER,
 * exponents fitting in a slong.
 */
#ifndef PSIKAPPA_SERIES_TSERIES_H
#define PSIKAPPA_SERIES_TSERIES_H

#include <flint/fmpq.h>
#include <flint/fmpq_mpoly.h>

#ifdef __cplusplus
extern "C" {
#endif

typedef struct {
    fmpq_mpoly_t p;   /* known part, deg_x(p) <= order */
    slong var;        /* index of the main variable x in the context */
    slong order;      /* p + O(x^(order+1)); -1 = nothing known */
} tseries;

enum {
    TS_OK = 0,
    TS_VAR_MISMATCH,         /* operands have different main variables */
    TS_DIVZERO,              /* divisor's constant term is zero */
    TS_NEEDS_ZERO_CONSTANT,  /* exp / compose / revert: constant term must be 0 */
    TS_NEEDS_UNIT_CONSTANT,  /* log: constant term must be 1; negative power: nonzero constant */
    TS_NEEDS_LINEAR_TERM,    /* revert: linear coefficient zero or unknown */
    TS_NOT_RATIONAL,         /* a coefficient that must be a rational number involves variables */
    TS_BADARG                /* invalid var/order, huge exponents, NULL */
};

/* Largest order accepted by the operations (beyond it they return TS_BADARG): the generic path
   works on dense coefficient vectors of length order + 1. */
#define TSERIES_MAX_ORDER ((slong) 1 << 20)

/* Largest |e| accepted by tseries_pow_si when the constant term is not 0, 1 or -1 (beyond it the
   coefficients' size explodes); larger requests return TS_BADARG. */
#define TSERIES_POW_MAX ((slong) 1 << 24)

/* Initialises s as the zero series p = 0 + O(x^(order+1)) in the variable of index var.
   order < -1 is stored as -1; an invalid var is stored and reported by later operations. */
void tseries_init(tseries *s, slong var, slong order, const fmpq_mpoly_ctx_t ctx);

/* Releases the polynomial of s.
   s may be initialised again afterwards. */
void tseries_clear(tseries *s, const fmpq_mpoly_ctx_t ctx);

/* s = p truncated to s->order (var and order of s are kept).
   p may be s->p. */
void tseries_set_mpoly(tseries *s, const fmpq_mpoly_t p, const fmpq_mpoly_ctx_t ctx);

/* r = a (polynomial, var and order copied).
   Aliasing allowed. */
void tseries_set(tseries *r, const tseries *a, const fmpq_mpoly_ctx_t ctx);


/* Lowers the order of s to min(s->order, order) and drops the terms above it.
   order < -1 is treated as -1. */
void tseries_truncate(tseries *s, slong order, const fmpq_mpoly_ctx_t ctx);

/* Lowest power of x present in the known part of s, -1 if it is zero.
   Returns -2 when s is invalid (var out of range). */
slong tseries_valuation(const tseries *s, const fmpq_mpoly_ctx_t ctx);

/* Returns 1 when every known coefficient of s is a rational number (p involves x only), else 0. */
int tseries_is_rational(const tseries *s, const fmpq_mpoly_ctx_t ctx);

/* r = a + b, r = a - b, r = a * b; the result's order is min(a->order, b->order).
   TS_VAR_MISMATCH when a and b have different main variables. */
int tseries_add(tseries *r, const tseries *a, const tseries *b, const fmpq_mpoly_ctx_t ctx);
int tseries_sub(tseries *r, const tseries *a, const tseries *b, const fmpq_mpoly_ctx_t ctx);
int tseries_mul(tseries *r, const tseries *a, const tseries *b, const fmpq_mpoly_ctx_t ctx);

/* r = c * a for a rational c (order of a kept).
   Returns TS_OK or TS_BADARG. */
int tseries_scalar_mul_fmpq(tseries *r, const tseries *a, const fmpq_t c, const fmpq_mpoly_ctx_t ctx);

/* r = a / b, order min(a->order, b->order).  b's x^0 coefficient must be a nonzero rational
   number: TS_DIVZERO when it is 0 (or unknown, b->order = -1), TS_NOT_RATIONAL when it involves
   other variables. */
int tseries_div(tseries *r, const tseries *a, const tseries *b, const fmpq_mpoly_ctx_t ctx);

/* r = d a / d(var) for any variable var of the context; for the main variable the order drops by
   one (to at least -1), otherwise it is kept.  TS_BADARG for var out of range. */
int tseries_derivative(tseries *r, const tseries *a, slong var, const fmpq_mpoly_ctx_t ctx);

/* r = antiderivative of a in var vanishing at var = 0; for the main variable the order rises by
   one (TS_BADARG if it would exceed TSERIES_MAX_ORDER), otherwise it is kept.  TS_BADARG for var
   out of range. */
int tseries_integral(tseries *r, const tseries *a, slong var, const fmpq_mpoly_ctx_t ctx);

/* r = f(g(x)), order min(f->order, g->order).  g's x^0 coefficient must be the zero polynomial
   (TS_NEEDS_ZERO_CONSTANT); f and g must share the main variable (TS_VAR_MISMATCH). */
int tseries_compose(tseries *r, const tseries *f, const tseries *g, const fmpq_mpoly_ctx_t ctx);

/* r = compositional inverse of f (f(r(x)) = x), order f->order.  Needs f(0) = 0
   (TS_NEEDS_ZERO_CONSTANT) and a known nonzero linear coefficient (TS_NEEDS_LINEAR_TERM) that is
   a rational number (TS_NOT_RATIONAL). */
int tseries_revert(tseries *r, const tseries *f, const fmpq_mpoly_ctx_t ctx);

/* r = exp(f), order f->order.  f's x^0 coefficient must be the zero polynomial
   (TS_NEEDS_ZERO_CONSTANT). */
int tseries_exp(tseries *r, const tseries *f, const fmpq_mpoly_ctx_t ctx);

/* r = log(f), order f->order.  f's x^0 coefficient must be exactly 1 (TS_NEEDS_UNIT_CONSTANT). */
int tseries_log(tseries *r, const tseries *f, const fmpq_mpoly_ctx_t ctx);

/* r = f^e, order f->order (f^0 = 1).  e < 0 needs a known x^0 coefficient that is a nonzero
   rational (TS_NEEDS_UNIT_CONSTANT if 0, TS_NOT_RATIONAL if it involves variables); |e| above
   TSERIES_POW_MAX with a constant term other than 0, 1, -1 gives TS_BADARG. */
int tseries_pow_si(tseries *r, const tseries *f, slong e, const fmpq_mpoly_ctx_t ctx);

/* c = coefficient of x^n in s (a polynomial in the other variables); 0 when n < 0 or n > order.
   c must be initialised and may not be s->p. */
void tseries_coeff(fmpq_mpoly_t c, const tseries *s, slong n, const fmpq_mpoly_ctx_t ctx);

/* r = known part of s evaluated at x = x0 (a polynomial in the other variables).
   Returns TS_OK, or TS_BADARG for an invalid s (r is then 0). */
int tseries_eval_fmpq(fmpq_mpoly_t r, const tseries *s, const fmpq_t x0, const fmpq_mpoly_ctx_t ctx);

#ifdef __cplusplus
}
#endif

#endif
