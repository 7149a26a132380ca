/* Environments: chains of scopes binding names to values, user functions and
   families of formal variables (var L_{1..6}). */
#ifndef PSIKAPPA_ENV_H
#define PSIKAPPA_ENV_H

#include "ast.h"
#include "value.h"

typedef enum { B_VALUE, B_FUNCTION, B_FAMILY } binding_kind;

typedef struct binding {
    binding_kind kind;
    char *name;           /* owned */
    value *val;           /* B_VALUE: owned reference */
    const node *def;      /* B_FUNCTION: the S_DEF node (owned by the program) */
    slong lo, hi;         /* B_FAMILY: declared index range */
} binding;

typedef struct scope {
    binding *items;
    int len, cap;
    struct scope *parent;
} scope;

scope *scope_new(scope *parent);
/* Frees the scope and its bindings (not the parent). */
void scope_free(scope *s);

/* Finds name in s or its ancestors; NULL when unbound. */
binding *scope_lookup(scope *s, const char *name);

/* Binds name in s itself, replacing a binding of the same name there.
   scope_bind_value takes over the reference v. */
void scope_bind_value(scope *s, const char *name, value *v);
void scope_bind_function(scope *s, const char *name, const node *def);
void scope_bind_family(scope *s, const char *name, slong lo, slong hi);

#endif
