/* Scalars: the exact coefficient ring Q[x_1, ..., x_k, pi, 1/pi] of the
   language (polynomials in the declared variables, Laurent polynomials in pi),
   one fmpq_mpoly context whose variables are the declared formal variables,
   then 1/pi, then the formal constant pi (kept last so that it prints last).
   1/pi is a ring variable of its own; scalar_normalise cancels pi * (1/pi), so
   that no term holds both. */
#ifndef PSIKAPPA_SCALAR_H
#define PSIKAPPA_SCALAR_H

#include <flint/fmpq_mpoly.h>

#define SCALAR_MAX_VARS 128                /* including pi */
#define SCALAR_PI (SCALAR_MAX_VARS - 1)    /* index of pi */
#define SCALAR_PINV (SCALAR_MAX_VARS - 2)  /* index of 1/pi */
#define SCALAR_MAX_DECLARED (SCALAR_MAX_VARS - 2) /* formal variables a script may declare */

typedef struct scalar_ring {
    fmpq_mpoly_ctx_t ctx;
    char *names[SCALAR_MAX_VARS];  /* owned; NULL for unused slots */
    int nvars;                     /* declared variables, pi excluded */
} scalar_ring;

void scalar_ring_init(scalar_ring *R);
void scalar_ring_clear(scalar_ring *R);

/* Index of the variable called name, declaring it if needed; -1 when all
   SCALAR_MAX_DECLARED slots are taken. */
int scalar_ring_declare(scalar_ring *R, const char *name);

/* Sets p to the variable of index var (or pi for SCALAR_PI). */
void scalar_set_gen(fmpq_mpoly_t p, const scalar_ring *R, int var);

/* Returns 1 and sets q when p is a rational constant, else 0. */
int scalar_get_fmpq(fmpq_t q, const fmpq_mpoly_t p, const scalar_ring *R);

/* Returns 1 and sets *v when p is an integer that fits in a slong, else 0. */
int scalar_get_slong(slong *v, const fmpq_mpoly_t p, const scalar_ring *R);

/* Returns 1 when p involves only pi and 1/pi (and so has a real decimal value). */
int scalar_is_pi_only(const fmpq_mpoly_t p, const scalar_ring *R);

/* Canonical readable form, e.g. 43/2880, pi^2/12, (L_1^2 + 4*pi^2)/48.
   The caller frees the returned string. */
char *scalar_get_str(const fmpq_mpoly_t p, const scalar_ring *R);

/* Term by term, each a rational times a monomial: L_1^2/48 + pi^2/12.
   The caller frees the string. */
char *scalar_get_str_termwise(const fmpq_mpoly_t p, const scalar_ring *R);

/* Joins the texts of the terms of p (each made by `term`) with + and -; the
   caller frees the result. Shared by the exact and LaTeX term-by-term forms. */
typedef char *(*scalar_term_fn)(const fmpq_mpoly_t term, const scalar_ring *R);
char *scalar_join_terms(const fmpq_mpoly_t p, const scalar_ring *R, scalar_term_fn term);

/* A plain serial form for storage: one term per line, "coefficient name^e ...".
   The caller frees the string. */
char *scalar_serialise(const fmpq_mpoly_t p, const scalar_ring *R);

/* Reads the serial form back into p, declaring variables named there if
   needed. Returns 1 on success, 0 on malformed text (p is then zero). */
int scalar_deserialise(fmpq_mpoly_t p, const char *text, scalar_ring *R);

/* The monomial of term i of p as text (e.g. L_1^2*pi^2), "" for 1; the caller frees it. */
char *scalar_monomial_str(const fmpq_mpoly_t p, slong i, const scalar_ring *R);

/* Laurent polynomials in pi (scalar_laurent.c). */

/* Cancels pi * (1/pi) in every term of p (in place). */
void scalar_normalise(fmpq_mpoly_t p, const scalar_ring *R);

/* r = p * pi^k for any integer k (negative powers through 1/pi), normalised. */
void scalar_mul_pi_pow(fmpq_mpoly_t r, const fmpq_mpoly_t p, slong k, const scalar_ring *R);

/* The largest power of 1/pi in p (0 when p is a polynomial in pi). */
slong scalar_pinv_degree(const fmpq_mpoly_t p, const scalar_ring *R);

/* r = a / b when the quotient is again in the ring: always when b is a
   nonzero rational times a power of pi (times a unit of the ring), otherwise
   when the part of b prime to pi divides a exactly. Returns 1 on success,
   0 when it does not divide (r is then zero); b must not be zero. */
int scalar_div(fmpq_mpoly_t r, const fmpq_mpoly_t a, const fmpq_mpoly_t b, const scalar_ring *R);

/* Whether b is invertible in the ring: a nonzero rational times a power of pi. */
int scalar_is_unit(const fmpq_mpoly_t b, const scalar_ring *R);

/* A collector of terms (coefficient, exponent vector of SCALAR_MAX_VARS entries) that become one
   polynomial in time linear in their number (scalar_terms.c).  The collector owns copies of the
   coefficients and exponents. */
typedef struct scalar_terms {
    fmpq *c;
    ulong *exps;
    slong len, alloc;
} scalar_terms;

void scalar_terms_init(scalar_terms *T);
void scalar_terms_clear(scalar_terms *T);
/* Appends c times the monomial exps (copied; zero coefficients are skipped). */
void scalar_terms_push(scalar_terms *T, const fmpq_t c, const ulong *exps);
/* res += the sum of the collected terms (equal monomials add up); empties T. */
void scalar_terms_add_to(fmpq_mpoly_t res, scalar_terms *T, const scalar_ring *R);

#endif
