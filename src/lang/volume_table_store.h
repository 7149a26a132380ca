/* The volume engine's tables of V_{g,n} kept in the results store (volume_table_store.c), so
   that a later run reads every V_{g,n} of a table computed once without recomputing it. */
#ifndef PSIKAPPA_VOLUME_TABLE_STORE_H
#define PSIKAPPA_VOLUME_TABLE_STORE_H

#include "interp.h"

/* When the store holds a table with V_{g,n} that also holds every entry of the session's table
   (I->wpv), reads it and makes it the session's table. Returns 1 when the session's table then
   holds V_{g,n}, 0 otherwise (store off, --verify, no such table, a row that does not read back
   as a whole table). Never reports an error: a miss only means computing. */
int voltab_store_fill(interp *I, slong g, slong n);

/* Writes the session's table (just computed in `seconds`) to the store, in one row, unless the
   store already has a table of as many points and at least as many genera. Nothing is written
   under --verify or with an interrupt pending. */
void voltab_store_keep(interp *I, double seconds);

/* Makes the (G+1) x (N+1) table t the session's volume table, releasing the one it replaces.
   Takes ownership of t. */
void voltab_adopt(interp *I, fmpq *t, slong G, slong N);

/* The text of the table t (entries g*(N+1)+n, g <= G, n <= N) as stored, and its reading:
   returns 1 and a new table (*t, *G, *N; caller clears (G+1)(N+1) entries) when text is one
   whole table in lowest terms with every unstable entry 0 and every stable one positive. For
   tests. */
char *voltab_text(const fmpq *t, slong G, slong N);
int voltab_read(const char *text, fmpq **t, slong *G, slong *N);

#endif
