/* Messages for the bracket forms of earlier versions of the language
   (int[g,n], sum[i = a..b], F[g], psi[e], wpvolume(g, n), ...): each names
   the subscript form that replaced it, so that an old script says at once
   how to write it now (tools/upgrade-syntax rewrites whole scripts). */
#ifndef PSIKAPPA_OLDSYNTAX_H
#define PSIKAPPA_OLDSYNTAX_H

#include <stddef.h>

/* Writes into buf the message for the reserved word kw (int, sum, prod, seq,
   table, F, psi, kappa, tau) met without its subscript; rest is the source
   text right after kw (NUL-terminated). When rest opens an old bracket form,
   the message shows that form rewritten, e.g. "int[2,0] is written int_{2,0}". */
void oldsyntax_keyword(const char *kw, const char *rest, char *buf, size_t size);

/* The new form of a function of earlier versions (e.g. "V_{g,n}" for
   wpvolume), or NULL when name is no such function. */
const char *oldsyntax_renamed_function(const char *name);

#endif
