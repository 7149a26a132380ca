/* Specialisations of the free energy: F_{g} with ... (specialise.c). */
#ifndef PSIKAPPA_SPECIALISE_H
#define PSIKAPPA_SPECIALISE_H

#include "interp.h"

/* F_{g} with ..., order x^N (specialise.c): the series, or its plan printed. */
value *specialise_value(interp *I, scope *s, const node *n);
int specialise_explain(interp *I, scope *s, const node *n);

#endif
