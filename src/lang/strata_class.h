/* Boundary divisors and strata as classes of the language (strata_class.c): the names
   delta_{irr} (also delta_irr), delta_{h}, delta_{h,S} and stratum_{g,n,k}, their check on the space of an integral, and the
   expansion of an integrand into terms (product of boundary divisors) x (psi-kappa class) that
   the strata route (route_strata.c) integrates with the stable-graph engine. */
#ifndef PSIKAPPA_STRATA_CLASS_H
#define PSIKAPPA_STRATA_CLASS_H

#include "interp.h"
#include "strata/sgint.h"

/* When n is delta_{...}, sets *out to the divisor (NULL after an error reported at n) and
   returns 1; 0 for any other subscripted name. */
int strata_class_subscript(interp *I, scope *s, const node *n, value **out);

/* The same for the plain name delta_irr. */
int strata_class_name(interp *I, const node *n, value **out);

/* Whether v is a class expression holding a boundary divisor. */
int strata_class_in_value(const value *v);

/* Products of more boundary divisors than this are beyond the engine (its edge limit). */
#define SC_MAX_FACTORS SG_MAX_E

/* One term of an expanded integrand: the strata and then the divisors d[0..nf) (sorted, nodes of the integrand, not
   owned) times the boundary-free class rest (owned). */
typedef struct {
    int nf;
    const cx *d[SC_MAX_FACTORS];
    cx *rest;
} sc_term;

typedef struct {
    slong len, cap;
    sc_term *t;
} sc_terms;

void sc_terms_init(sc_terms *T);
void sc_terms_clear(sc_terms *T);

/* Expands e into T (initialised by the caller): the terms with the same divisors are merged,
   those with more than max_factors divisors (zero by degree) dropped.  Returns 0 after
   reporting at where (or at the divisor responsible) what cannot be expanded: exp of a
   boundary class, a power above SC_MAX_POWER, more than SC_MAX_TERMS products. */
#define SC_MAX_POWER 1000
#define SC_MAX_TERMS 10000
int sc_expand_integrand(sc_terms *T, const node *where, const cx *e, slong max_factors);

/* The graph G of the stratum st (CX_STRATUM) after checking that it is a class of Mbar_{g,n}; 0
   after reporting at st's node (or where). */
int sc_stratum_graph(interp *I, sgraph *G, const node *where, slong g, slong n, const cx *st);

/* The divisor d on Mbar_{g,n} as the engine's sg_divisor; 0 after reporting at d's node (or
   where) why it does not exist there. */
int sc_divisor_on(sg_divisor *D, const node *where, slong g, slong n, const cx *d);

#endif
