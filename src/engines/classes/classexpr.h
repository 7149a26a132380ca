/* Class expressions: sums and products of psi and kappa classes with scalar
   coefficients, kept lazy until the space Mbar_{g,n} is known, then expanded
   into a truncated class polynomial (cpoly.h). exp() and powers are only
   meaningful up to the dimension 3g-3+n, which is why nothing is expanded
   early. This module knows FLINT, not the language. */
#ifndef PSIKAPPA_CLASSEXPR_H
#define PSIKAPPA_CLASSEXPR_H

#include <flint/fmpq_mpoly.h>

/* CX_LAMBDA and CX_CH are the Chern classes lambda_j = c_j(E) and the Chern character components
   ch_k(E) of the Hodge bundle E (index >= 0; docs/conventions.md, "The Hodge bundle").
   CX_BOUNDARY is a boundary divisor: delta_irr (index CX_BOUNDARY_IRR) or delta_{h,S} (index h,
   legs the set S, bit i for leg i+1), read on the space int_{g,n} names (src/lang/strata_class.c).
   CX_STRATUM is the stratum class of the k-th stable graph of Mbar_{g,n} (graph = {g, n, k},
   index its codimension, the number of edges). */
typedef enum { CX_SCALAR, CX_PSI, CX_KAPPA, CX_ADD, CX_MUL, CX_POW, CX_EXP, CX_LAMBDA, CX_CH, CX_THETA,
               CX_BOUNDARY, CX_STRATUM } cx_kind;

typedef struct cx {
    cx_kind kind;
    int refs;
    slong index;                           /* psi/kappa index; exponent of CX_POW; genus of CX_BOUNDARY */
    ulong legs;                            /* CX_BOUNDARY: the leg set S, bit i for leg i+1 */
    slong graph[3];                        /* CX_STRATUM: g, n and the graph number k (1-based) */
    fmpq_mpoly_t scalar;                   /* CX_SCALAR only */
    const fmpq_mpoly_ctx_struct *ctx;      /* ring of the scalars (not owned) */
    struct cx *a, *b;                      /* owned references */
    const void *origin;                    /* caller's tag for messages (not owned) */
} cx;

/* Constructors return a new reference; the ones taking cx arguments take over
   the caller's references to them. */
cx *cx_scalar(const fmpq_mpoly_t c, const fmpq_mpoly_ctx_t ctx);
cx *cx_psi(slong i, const fmpq_mpoly_ctx_t ctx, const void *origin);
cx *cx_kappa(slong j, const fmpq_mpoly_ctx_t ctx, const void *origin);
/* Norbury's class Theta_{g,n} (degree 2g-2+n): only the Theta adaptor (theta_lang.c) integrates it. */
cx *cx_theta(const fmpq_mpoly_ctx_t ctx, const void *origin);
/* A boundary divisor of degree 1 (see CX_BOUNDARY): h = CX_BOUNDARY_IRR for delta_irr. Whether it
   exists on Mbar_{g,n} is checked when the space is known. */
#define CX_BOUNDARY_IRR (-1)
cx *cx_boundary(slong h, ulong legs, const fmpq_mpoly_ctx_t ctx, const void *origin);
/* The stratum of graph k of Mbar_{g,n}, of codimension `edges` (degree). */
cx *cx_stratum(slong g, slong n, slong k, slong edges, const fmpq_mpoly_ctx_t ctx, const void *origin);
/* Whether e contains a boundary divisor or stratum. */
int cx_has_boundary(const cx *e);
cx *cx_lambda(slong j, const fmpq_mpoly_ctx_t ctx, const void *origin);
cx *cx_ch(slong k, const fmpq_mpoly_ctx_t ctx, const void *origin);
cx *cx_add(cx *a, cx *b);
cx *cx_mul(cx *a, cx *b);
cx *cx_pow(cx *a, slong k, const void *origin);
cx *cx_exp(cx *a, const void *origin);

cx *cx_ref(cx *e);
void cx_release(cx *e);

/* Recognises f*exp(c*kappa_1) for scalars f, c (each 1 when absent); sets both. */
int cx_match_exp_kappa1(const cx *e, fmpq_mpoly_t c, fmpq_mpoly_t factor);

/* Recognises c*kappa_1^k (c = 1 when absent); sets c and k. */
int cx_match_kappa1_power(const cx *e, fmpq_mpoly_t c, slong *k);

/* A product factor * psi_1^{psi[0]} ... psi_n^{psi[n-1]} * kappa_1^{kappa1} (* exp(c kappa_1)
   if is_exp).  The caller initialises and clears factor and c in the ring of the scalars. */
#define CX_MONOMIAL_MAX_PSI 16
typedef struct {
    fmpq_mpoly_t factor, c;
    slong psi[CX_MONOMIAL_MAX_PSI];
    slong kappa1;
    int is_exp;
} cx_monomial;

/* Recognises such a product (any nesting of products and powers, scalars anywhere, at most
   one exp) on n <= CX_MONOMIAL_MAX_PSI points; fills m.  Returns 0 (m unspecified) for any
   other expression, e.g. a sum or psi_i with i > n. */
int cx_match_psi_kappa1(const cx *e, slong n, cx_monomial *m);

/* Recognises factor * exp(c kappa_1 + b_1 psi_1 + ... + b_n psi_n), scalars anywhere in the
   sum's terms, each term a scalar times one psi_i (1 <= i <= n) or kappa_1, no constant term.
   factor, c and b[0..n) are initialised by the caller in the ring of the scalars; returns 0
   (their values unspecified) for any other expression. */
int cx_match_exp_linear(const cx *e, slong n, fmpq_mpoly_t factor, fmpq_mpoly_t c, fmpq_mpoly_struct *b);

/* Whether e contains a Hodge class (lambda_j or ch_k): such integrands go to src/engines/hodge/. */
int cx_has_hodge(const cx *e);
/* The operands x0, x1, ..., xk of a left-nested chain ((x0 op x1) op ...) op xk of nodes of
   the given kind (sums and products built in loops have this shape), in order, so that
   walkers can loop over long chains instead of recursing. Returns k+1 and sets *ops to a new
   array (the caller frees it; the nodes stay owned by e). */
slong cx_chain(const cx *e, cx_kind kind, const cx ***ops);

/* Largest psi index used, so that callers can check it against n early. */
slong cx_max_psi(const cx *e);

/* An upper bound on the degrees of the classes in e (psi_i has degree 1, kappa_j degree j),
   WORD_MAX when unbounded (any exp): an integrand whose bound is
   below the dimension 3g-3+n integrates to 0 without being expanded. */
slong cx_max_degree(const cx *e);

#endif
