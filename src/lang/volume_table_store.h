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

/* Writes the table t of V_{g,n}, g <= G, n <= N (entries g*(N+1)+n, 0 for the unstable ones;
   computed in `seconds`) to the store with its index entry, all in one transaction, unless the
   store already has a table of N points and at least G genera. Returns VOLTAB_WRITTEN,
   VOLTAB_HELD (as much stored already) or VOLTAB_NOT_WRITTEN (store off, --verify, too quick
   to keep, an interrupt pending, or a write that failed: reported by the store). */
enum { VOLTAB_NOT_WRITTEN, VOLTAB_WRITTEN, VOLTAB_HELD };
int voltab_store_table(interp *I, const fmpq *t, slong G, slong N, double seconds);

/* Reads a table file written by psikappa-volumes-mpi (one line "g n numerator/denominator" per
   stable (g, n), g <= G, n <= N, g then n ascending; a bare integer is also read), checks every
   value against the engine's residues modulo one prime that no run of the driver uses, and
   stores it as the table (G, N) (voltab_store_table). Prints what was stored on I->out. Returns
   0, or 1 after reporting on stderr (path:line for a line that is wrong); nothing is stored
   unless every line reads and every value agrees. (volume_import.c) */
int voltab_import_file(interp *I, const char *path);

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
