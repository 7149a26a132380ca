/* Expansion of a class expression into a class polynomial, with every way it
   can fail reported in words at the responsible node: the one place for the
   integrals of every class family (integrate.c, theta_lang.c, hodge_lang.c). */
#ifndef PSIKAPPA_CLASS_EXPAND_H
#define PSIKAPPA_CLASS_EXPAND_H

#include "classes/cpoly.h"
#include "interp.h"

/* Adds the expansion of c to P (initialised by the caller for its space and
   slots). Returns 1 on success; otherwise reports at the node that caused the
   failure, or at `where`, and returns 0. c stays owned by the caller. */
int class_expand_reported(cpoly *P, const node *where, const cx *c);

#endif
