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
double results_clock(void);
void results_close(interp *I);

#endif
