/* Routes of int_{g,n}: every way of computing an integral has the same interface (name,
   applies, estimate, run) and one entry in the router's table (router.c). The router
   describes the integrand once (its family and, for the volume engine, its form), asks each
   route that applies for an estimate, runs the cheapest, and under --verify runs the route
   named as its check and compares. Routes never call the router. */
#ifndef PSIKAPPA_ROUTE_H
#define PSIKAPPA_ROUTE_H

#include <flint/fmpq_mpoly.h>

#include "classes/cpoly.h"
#include "interp.h"
#include "volumes/wpoly.h"

/* The class family of an integrand: which engines can integrate it at all. */
typedef enum { INTEGRAND_PSI_KAPPA, INTEGRAND_HODGE, INTEGRAND_THETA, INTEGRAND_STRATA } integrand_family;

/* The forms the volume engine computes without expanding (route_volume.c). */
typedef enum {
    VOLUME_FORM_NONE,
    VOLUME_FORM_EXP_KAPPA1,    /* f * exp(c kappa_1) */
    VOLUME_FORM_KAPPA1_POWER,  /* c * kappa_1^D */
    VOLUME_FORM_PSI_KAPPA1,    /* f * psi^a * kappa_1^k (* exp(c kappa_1)), some a_i > 0 */
    VOLUME_FORM_EXP_LINEAR     /* f * exp(c kappa_1 + sum_i b_i psi_i), c != 0 */
} volume_form_kind;

typedef struct volume_form {
    volume_form_kind kind;
    fmpq_mpoly_t f, c;                      /* factor and kappa_1 coefficient */
    fmpq_mpoly_struct b[WPOLY_MAX_POINTS];  /* psi_i coefficients (EXP_LINEAR) */
    slong psi[WPOLY_MAX_POINTS];            /* the exponents a, sorted decreasingly (PSI_KAPPA1) */
    slong psi_degree, kappa1;               /* |a| and the power of kappa_1 (PSI_KAPPA1) */
    int is_exp;                             /* PSI_KAPPA1 with exp(c kappa_1) */
} volume_form;

/* One integral as the routes see it: the question and what the router found out about it.
   The expansion into monomials is made on first request and shared by the routes. */
typedef struct integral {
    interp *I;
    const node *where;        /* errors are reported here */
    slong g, n;
    const value *integrand;   /* a number or a class expression (not owned) */
    integrand_family family;
    volume_form form;
    cpoly P;                  /* the expansion (integral_expansion) */
    int expanded;             /* 0 not yet, 1 made, -1 failed (reported) */
    int theta_why;            /* Theta-linear part: THETA_ZERO_* of the terms split off it */
} integral;

/* A route's estimate of one integral: refusal is NULL when it runs within the limits, else
   a reason (a VERIFY_WHY_* text) and msg the error a user reads if no route can run. */
typedef struct route_cost {
    double seconds;
    const char *refusal;
    char msg[320];
} route_cost;

/* What a route reports when it runs as the check of another (run with a route_check): the
   monomials it computed itself and those out of its reach, for which it took the first
   route's value; or, when it could not start at all, the reason (value NULL, no error). */
typedef struct route_check {
    double checked, unchecked;
    const char *out_of_reach;
} route_check;

typedef struct route {
    const char *name;                         /* in messages: "the pushforward reduction" */
    int (*applies)(integral *q);
    void (*estimate)(integral *q, route_cost *cost);
    /* The integral as a new value, or NULL after reporting an error at q->where. With check
       (as the second route of --verify) limits are no error: see route_check. */
    value *(*run)(integral *q, route_check *check);
    const struct route *checked_by;           /* its second route under --verify, or NULL */
} route;

/* The routes (one file each). */
extern const route route_volume_engine;   /* route_volume.c */
extern const route route_reduction;       /* route_reduction.c */
extern const route route_time_shift;      /* route_time_shift.c */
extern const route route_hodge_operator;  /* route_hodge.c */
extern const route route_hodge_mumford;   /* route_hodge.c */
extern const route route_theta;           /* route_theta.c */
extern const route route_theta_shift;     /* route_theta.c */
extern const route route_strata;          /* route_strata.c */
extern const route route_strata_reverse;  /* route_strata.c */

/* explain int_{g,n} ... for an integrand with boundary divisors: each product of divisors with
   its number of strata, its psi-kappa cofactor and its share of the value (route_strata.c).
   Returns 0 after reporting an error. */
int strata_route_explain(integral *q);

/* Recognises the forms of the volume engine in q->integrand; sets q->form (route_volume.c). */
void volume_form_match(integral *q);
void volume_form_clear(integral *q);

/* Describes int_{g,n} integrand once (router.c): its family and volume form; integral_clear
   releases what it holds (the integrand stays the caller's). */
void integral_init(integral *q, interp *I, const node *where, slong g, slong n, const value *integrand);
void integral_clear(integral *q);

/* The expansion of q's integrand into monomials (psi-kappa, with the Hodge slots for the Hodge
   family), made once; NULL after reporting why it failed. */
const cpoly *integral_expansion(integral *q);

#endif
