/* tseries_internal.h - coefficient-vector layer of tseries and the generic (non-FLINT-series)
 * algorithms, shared by tseries*.c and exposed to tests/unit/test_series.c so that the generic
 * path can be compared with the rational fast path on the same rational input.
 *
 * A tsvec holds the coefficients c[0..len-1] of x^0..x^(len-1) as fmpq_mpoly not involving x.
 * Ownership: tsvec_init allocates len initialised polynomials, tsvec_clear releases them.  Output
 * vectors of the tsvec_* algorithms must be distinct from their inputs unless stated otherwise.
 */
#ifndef PSIKAPPA_SERIES_TSERIES_INTERNAL_H
#define PSIKAPPA_SERIES_TSERIES_INTERNAL_H

#include <flint/fmpq_poly.h>
#include "series/tseries.h"

typedef struct {
    fmpq_mpoly_struct *c;  /* len coefficients (NULL when len == 0) */
    slong len;
} tsvec;

/* Allocates len zero coefficients (len < 0 treated as 0).
   Must be paired with tsvec_clear. */
void tsvec_init(tsvec *v, slong len, const fmpq_mpoly_ctx_t ctx);

/* Releases the coefficients; v is left empty. */
void tsvec_clear(tsvec *v, const fmpq_mpoly_ctx_t ctx);

/* Fills v (already initialised, any len) with the coefficients of x^0..x^(v->len-1) of p in the
   variable var; higher powers are dropped.  Precondition: exponents of p fit in a ulong. */
void tsvec_from_mpoly(tsvec *v, const fmpq_mpoly_t p, slong var, const fmpq_mpoly_ctx_t ctx);

/* p = sum_i v->c[i] x^i (the c[i] must not involve x).
   p must not be one of the coefficients. */
void tsvec_to_mpoly(fmpq_mpoly_t p, const tsvec *v, slong var, const fmpq_mpoly_ctx_t ctx);

/* r = a * b mod x^r->len (r distinct from a, b; a, b of length >= r->len or shorter = zero-padded). */
void tsvec_mullow(tsvec *r, const tsvec *a, const tsvec *b, const fmpq_mpoly_ctx_t ctx);

/* q = a / b mod x^q->len; b->c[0] must be a nonzero rational constant (caller checks).
   q distinct from a and b. */
void tsvec_div(tsvec *q, const tsvec *a, const tsvec *b, const fmpq_mpoly_ctx_t ctx);

/* g = exp(f) mod x^g->len by k g_k = sum_j j f_j g_{k-j}; f->c[0] must be 0 (caller checks). */
void tsvec_exp(tsvec *g, const tsvec *f, const fmpq_mpoly_ctx_t ctx);

/* g = log(f) mod x^g->len by k g_k = k f_k - sum_{j<k} j g_j f_{k-j}; f->c[0] must be 1. */
void tsvec_log(tsvec *g, const tsvec *f, const fmpq_mpoly_ctx_t ctx);

/* r = f^e mod x^r->len, e >= 0, by binary powering. */
void tsvec_pow_ui(tsvec *r, const tsvec *f, ulong e, const fmpq_mpoly_ctx_t ctx);

/* r = f(g) mod x^r->len by Horner's rule; g->c[0] must be 0 (caller checks). */
void tsvec_compose(tsvec *r, const tsvec *f, const tsvec *g, const fmpq_mpoly_ctx_t ctx);

/* r = compositional inverse of f mod x^r->len by Lagrange inversion,
   [x^m] r = (1/m) [z^(m-1)] (z/f(z))^m.  f->c[0] = 0, f->c[1] a nonzero rational (caller checks). */
void tsvec_revert(tsvec *r, const tsvec *f, const fmpq_mpoly_ctx_t ctx);

/* Generic-path versions of the tseries operations: same contracts as tseries_mul, _div, _exp,
   _log, _pow_si, _compose, _revert, but never taking the fmpq_poly fast path (used by tests). */
int tseries_generic_mul(tseries *r, const tseries *a, const tseries *b, const fmpq_mpoly_ctx_t ctx);
int tseries_generic_div(tseries *r, const tseries *a, const tseries *b, const fmpq_mpoly_ctx_t ctx);
int tseries_generic_exp(tseries *r, const tseries *f, const fmpq_mpoly_ctx_t ctx);
int tseries_generic_log(tseries *r, const tseries *f, const fmpq_mpoly_ctx_t ctx);
int tseries_generic_pow_si(tseries *r, const tseries *f, slong e, const fmpq_mpoly_ctx_t ctx);
int tseries_generic_compose(tseries *r, const tseries *f, const tseries *g, const fmpq_mpoly_ctx_t ctx);
int tseries_generic_revert(tseries *r, const tseries *f, const fmpq_mpoly_ctx_t ctx);

/* Returns TS_OK when s has a valid var, -1 <= order <= TSERIES_MAX_ORDER and slong-sized
   exponents, else TS_BADARG. */
int tseries_check(const tseries *s, const fmpq_mpoly_ctx_t ctx);

/* As tseries_check for both operands, then TS_VAR_MISMATCH if their main variables differ. */
int tseries_check_pair(const tseries *a, const tseries *b, const fmpq_mpoly_ctx_t ctx);

/* Main variable of a possibly NULL operand (0 for NULL), for error results. */
static inline slong tseries_var_of(const tseries *a)
{
    return a == NULL ? 0 : a->var;
}

/* Sets r to zero with order -1 and var `var` (the error result). */
void tseries_set_error(tseries *r, slong var, const fmpq_mpoly_ctx_t ctx);

/* Classifies the x^0 coefficient of s: 0 if it is the zero polynomial, 1 if it is a nonzero
   rational (stored in c when c != NULL), 2 if it involves other variables. */
int tseries_constant_kind(fmpq_t c, const tseries *s, const fmpq_mpoly_ctx_t ctx);

/* Returns 1 and sets q to the known part of s when every coefficient is rational, else 0. */
int tseries_get_fmpq_poly(fmpq_poly_t q, const tseries *s, const fmpq_mpoly_ctx_t ctx);

/* s->p = q truncated to s->order (var and order of s kept). */
void tseries_set_fmpq_poly(tseries *s, const fmpq_poly_t q, const fmpq_mpoly_ctx_t ctx);

/* Initialises v with the s->order + 1 known coefficients of s (must be paired with tsvec_clear). */
void tsvec_init_series(tsvec *v, const tseries *s, const fmpq_mpoly_ctx_t ctx);

/* Sets r to the series sum v->c[i] x^i in var with the given order (v->len must be order + 1). */
void tseries_set_tsvec(tseries *r, const tsvec *v, slong var, slong order, const fmpq_mpoly_ctx_t ctx);

#endif
