/* Values of the language: exact scalars (polynomials over Q in the declared
   variables and pi), lazy class expressions, and strings. Values are
   reference counted and immutable once built. */
#ifndef PSIKAPPA_VALUE_H
#define PSIKAPPA_VALUE_H

#include <flint/fmpq_mpoly.h>

#include "classes/classexpr.h"
#include "scalar.h"
#include "series/tseries.h"
#include "arb_compat.h"

typedef enum { V_NUM, V_CLASS, V_STR, V_SERIES, V_LIST, V_REAL } value_kind;

typedef struct value {
    value_kind kind;
    int refs;
    fmpq_mpoly_t num;                   /* V_NUM */
    cx *cls;                            /* V_CLASS, owned reference */
    char *str;                          /* V_STR, owned */
    tseries *ser;                       /* V_SERIES, owned */
    struct value **items;               /* V_LIST: owned references */
    slong len;                          /* V_LIST: number of items */
    arb_struct *re;                     /* V_REAL: a certified ball (owned) */
    int termwise;                       /* V_NUM: print term by term (rational * monomial) */
    const fmpq_mpoly_ctx_struct *ctx;   /* ring of num (not owned) */
} value;

/* Constructors return a new reference owned by the caller. */
value *value_new_num(const scalar_ring *R);            /* zero */
value *value_new_si(const scalar_ring *R, slong c);
value *value_new_fmpq(const scalar_ring *R, const fmpq_t c);
value *value_new_class(cx *c, const scalar_ring *R);   /* takes the reference c */
value *value_new_str(char *s, const scalar_ring *R);   /* takes ownership of s */
/* A zero series in variable var known to order `order`, to be filled by the caller. */
value *value_new_series(slong var, slong order, const scalar_ring *R);

/* A list of len items, each set by the caller (it owns the references it puts there). */
value *value_new_list(slong len, const scalar_ring *R);

/* A real ball (zero), to be set by the caller; arithmetic on it is ball arithmetic. */
value *value_new_real(const scalar_ring *R);

value *value_ref(value *v);
void value_release(value *v);

/* A class-expression view of v (a scalar becomes a constant class); new reference. */
cx *value_to_class(const value *v);


/* The name of v's kind for messages ("number", "class", "string"). */
const char *value_kind_name(const value *v);

#endif
