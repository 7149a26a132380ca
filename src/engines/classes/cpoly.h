/* Class polynomials on Mbar_{g,n}: finite sums of monomials
   prod psi_i^{a_i} prod kappa_j^{m_j} with coefficients in the scalar ring,
   truncated above the dimension D = 3g-3+n (psi_i has degree 1, kappa_j
   degree j). Terms are found through a hash of their exponent vectors.
   A polynomial made with cpoly_init_hodge also holds the Hodge classes
   lambda_1..lambda_g and ch_1..ch_D (degrees j and k); lambda_0 = 1,
   ch_0 = g, lambda_j = 0 for j > g (E has rank g) and ch_{2k} = 0 for k >= 1
   (Mumford) are applied while expanding. */
#ifndef PSIKAPPA_CPOLY_H
#define PSIKAPPA_CPOLY_H

#include <stdatomic.h>
#include <stdint.h>
#include <signal.h>

#include <flint/fmpq.h>
#include <flint/fmpq_mpoly.h>

#include "classexpr.h"

typedef uint16_t cpoly_exp;

typedef struct cpoly {
    slong g, n, D;          /* the space and its dimension */
    slong nexp;             /* exponents per term: psi_1..psi_n, kappa_1..kappa_D
                               [, lambda_1..lambda_g, ch_1..ch_D when hodge] */
    int hodge;              /* whether the Hodge slots exist */
    slong len, alloc;
    cpoly_exp *exps;        /* len * nexp */
    slong *deg;             /* weighted degree of each term */
    fmpq_mpoly_struct *coeffs;
    slong *slots;           /* open-addressing index into the terms, -1 empty */
    slong nslots;
    slong max_terms;        /* refuse to grow past this (0: no limit) */
    const fmpq_mpoly_ctx_struct *ctx;
} cpoly;

enum { CPOLY_OK = 0, CPOLY_PSI_RANGE, CPOLY_EXP_CONSTANT, CPOLY_TOO_DEEP, CPOLY_TOO_BIG, CPOLY_THETA, CPOLY_HODGE, CPOLY_CANCELLED,
       CPOLY_BOUNDARY };

/* Makes cpoly_expand poll *flag (e.g. set by a signal handler) along long chains of sums and
   products and stop with CPOLY_CANCELLED once it is nonzero; NULL turns polling off. The
   flag is not owned. */
void cpoly_set_cancel(atomic_int *flag);

/* A space needs D <= CPOLY_MAX_DIM so that exponents fit cpoly_exp. */
#define CPOLY_MAX_DIM 60000

void cpoly_init(cpoly *P, slong g, slong n, slong max_terms, const fmpq_mpoly_ctx_t ctx);
/* As cpoly_init, with the Hodge slots (a polynomial made by cpoly_init meets lambda_j or ch_k
   with CPOLY_HODGE). */
void cpoly_init_hodge(cpoly *P, slong g, slong n, slong max_terms, const fmpq_mpoly_ctx_t ctx);
void cpoly_clear(cpoly *P);

/* As cpoly_init, but truncated at degree D instead of 3g-3+n (0 <= D <= 3g-3+n): the part of an
   integrand multiplying a class of degree 3g-3+n-D. */
void cpoly_init_degree(cpoly *P, slong g, slong n, slong D, slong max_terms, const fmpq_mpoly_ctx_t ctx);

/* Expands e on Mbar_{g,n} into P (initialised by the caller with the same g, n).
   Returns CPOLY_OK, or an error code with *bad set to the node at fault
   (psi index out of 1..n, exp of a class with a degree-0 part, too many terms). */
int cpoly_expand(cpoly *P, const cx *e, const cx **bad);

/* Integral over Mbar_{g,n} of one monomial; psi has n entries, kmult[1..kmax]
   the kappa exponents. Returns 0 on success, nonzero to abort the integration. */
typedef int (*cpoly_integral_fn)(fmpq_t res, void *data, slong g, const slong *psi, slong n,
                                 const slong *kmult, slong kmax);

/* res = sum over terms of top degree D of coeff * integral(monomial).
   Returns 0, or the first nonzero code returned by f. */
int cpoly_integrate(fmpq_mpoly_t res, const cpoly *P, cpoly_integral_fn f, void *data);

/* Calls f on every top-degree term (psi exponents, kappa multiplicities and coefficient). */
typedef int (*cpoly_term_fn)(void *data, const slong *psi, slong n, const slong *kmult, slong kmax,
                             const fmpq_mpoly_t coeff);
int cpoly_foreach_top(const cpoly *P, cpoly_term_fn f, void *data);

/* The same for a polynomial with Hodge slots: also lambda multiplicities lmult[1..lmax] and ch
   multiplicities cmult[1..cmax] (index 0 of each is 0). */
typedef int (*cpoly_hodge_term_fn)(void *data, const slong *psi, slong n, const slong *kmult, slong kmax,
                                   const slong *lmult, slong lmax, const slong *cmult, slong cmax,
                                   const fmpq_mpoly_t coeff);
int cpoly_foreach_top_hodge(const cpoly *P, cpoly_hodge_term_fn f, void *data);

#endif
