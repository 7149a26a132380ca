/* The table format shared by the files that define builtin functions. */
#ifndef PSIKAPPA_BUILTINS_H
#define PSIKAPPA_BUILTINS_H

#include "interp.h"

/* A builtin receives its evaluated arguments (borrowed) and returns a new
   reference, or NULL after reporting an error. */
typedef value *(*builtin_fn)(interp *I, const node *call, value **args);

typedef struct {
    const char *name;
    int nargs;
    builtin_fn fn;
    const char *usage;
} builtin;

extern const builtin builtins_core[];    /* builtins.c, ends with a NULL name */
extern const builtin builtins_series[];  /* builtins_series.c */
extern const builtin builtins_toolkit[]; /* toolkit.c: sequences, extrapolation, recognition, plots */
extern const builtin builtins_toolkit_factorial[]; /* toolkit_factorial.c: richardson_factorial */
extern const builtin builtins_spectral[]; /* builtins_spectral.c: spectral curves, sin/cos/sinh/cosh */
extern const builtin builtins_strata[];   /* builtins_strata.c: integrals against boundary strata */
extern const builtin builtins_real[];    /* real_funcs.c: sqrt, gamma, zeta, besselj, numeric */
extern const builtin builtins_subs[];     /* builtins_subs.c: subs, degree, coefficients */
/* P (a number) with the monomial of exponents a replaced by v (number or real); new reference or NULL
   after reporting at call (builtins_subs.c). */
value *subs_apply(interp *I, const node *call, const value *p, const ulong *a, const value *v);
/* p with the variable of ring index vars[i] replaced by args[i] for i < n, all at once (so
   that L_1 -> L_2, L_2 -> L_1 swaps them): exact arguments give an exact value; with a real
   argument every argument must be a number and the value is a real. call is a node whose list
   holds the argument nodes (for error positions). Returns a new value, or NULL after
   reporting. */
value *subs_lengths(interp *I, const node *call, const value *p, const int *vars, slong n, value **args);
/* explain of a spectral-curve call (builtins_spectral.c): 1 when name is one, see spectral_explain. */
int spectral_explains(scope *s, const char *name);
/* Prints the dictionary of omega/curve_volume/omega_coeff call; 0 after an error. */
int spectral_explain(interp *I, scope *s, const node *call);

/* Reports msg at the call's argument i (or the call itself when i < 0). */
value *builtin_fail_at(const node *call, int i, const char *msg);
/* Reads argument i as an integer in [lo, hi]; 0 after reporting an error. */
int builtin_get_slong(interp *I, const node *call, value **args, int i, slong lo, slong hi, slong *out);
/* Reads argument i as a declared formal variable; returns its index or -1 after an error. */
slong builtin_get_var(interp *I, const node *call, value **args, int i);

/* Builtin functions (builtins.c): returns 1 and sets *result when name is a
   builtin (result NULL after an error was reported), 0 when it is not. */
int builtin_call(interp *I, scope *s, const node *call, value **result);

#endif
