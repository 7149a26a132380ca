/* The results store as the language uses it (results.c). */
#ifndef PSIKAPPA_RESULTS_H
#define PSIKAPPA_RESULTS_H

#include "interp.h"

/* The results store (results.c). A question is identified by the hash of its
   complete canonical form (results_key.h); label is a short text for people
   reading the file (owned). results_question_integral returns 0 when the store
   is off or no key can be formed: the answer is then neither looked up nor
   stored. lookup returns 1 and sets out on a hit. */
typedef struct results_question {
    char key[65];
    char *label;
} results_question;
int results_question_integral(interp *I, slong g, slong n, const cx *e, results_question *q);
void results_question_clear(results_question *q);
int results_lookup(interp *I, const results_question *q, fmpq_mpoly_t out);
void results_save(interp *I, const results_question *q, const fmpq_mpoly_t value, double seconds);
/* The same for answers that are not one scalar (e.g. a table of volumes), as text the caller
   writes and reads: lookup returns 1 and a new string in *answer (caller frees) on a hit; save
   writes text under key unless it took less than the store's minimum time or an interrupt is
   pending, and returns 1 when the row was written (one transaction: all of it or nothing). */
int results_lookup_text(interp *I, const char *key, char **answer);
int results_save_text(interp *I, const char *key, const char *label, const char *text, double seconds);
double results_clock(void);
/* Brackets a read-modify-write of several rows as one store transaction (store_begin):
   results_begin returns 1 when it began, and then results_end must follow. */
int results_begin(interp *I);
void results_end(interp *I);

void results_close(interp *I);

#endif
