/* The size of a class expression as a tree. Expressions share subexpressions
   (let c = a*a; c*c; ...), so a small graph can stand for an astronomically
   large tree, and every walker that visits children separately (expansion,
   degree bounds, matching) would run for ever on it. */
#ifndef PSIKAPPA_CXSIZE_H
#define PSIKAPPA_CXSIZE_H

#include "classexpr.h"

/* Number of nodes of e unfolded into a tree, counted over the shared graph
   in time linear in its number of distinct nodes (no recursion); saturates
   at cap, and returns cap as soon as the count reaches it. */
double cx_tree_size(const cx *e, double cap);

#endif
