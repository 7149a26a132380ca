/* Engine failures in words: the one place where a status code of an engine becomes a message.
   A pending interrupt or timeout is reported first, whatever code it made the engine return. */
#ifndef PSIKAPPA_FAILURE_H
#define PSIKAPPA_FAILURE_H

#include "source.h"
#include "ast.h"

/* The words of one status code of an engine; a table ends with text NULL. */
typedef struct failure_words {
    int code;
    const char *text;
} failure_words;

/* Reports a pending interrupt or timeout at n and returns 1; 0 when none. */
int failure_cancelled(const node *n);

/* Reports status rc of `engine` (e.g. "the Hodge engine") at where: a cancellation when one is
   pending or rc is the engine's cancelled code, else the words of rc in table, else that the
   engine rejected the request with its code. */
void failure_report(const node *where, const char *engine, int rc, int cancelled_code, const failure_words *table);

#endif
