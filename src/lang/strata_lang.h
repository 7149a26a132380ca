/* The language's bridge to the stable-graph engine (src/strata/): stablegraphs_{g,n},
   stablegraphs_{g,n,k}, graphcount_{g,n}, mvvolume_{g,n}, multicurves_{g,n} (strata_lang.c). */
#ifndef PSIKAPPA_STRATA_LANG_H
#define PSIKAPPA_STRATA_LANG_H

#include "interp.h"
#include "strata/sgraph.h"

/* When n is one of the names above with its subscripts, sets *out to the value (NULL after an
   error reported at n) and returns 1; returns 0 for any other name. */
int strata_lang_subscript(interp *I, scope *s, const node *n, value **out);

/* The graphs of Mbar_{g,n} (k >= 0: with k edges) into L (initialised here; the caller clears it
   on success), after refusing an estimated count above --max-table / 30; 0 after an error at n. */
int strata_lang_graphs(interp *I, const node *n, int g, int np, int k, sg_list *L);

#endif
