/* Standard output as whole records. A statement formats what it prints into
   a record in memory (the stream sink_stream returns, which the interpreter
   keeps as I->out); only when the statement succeeds is the record written,
   whole, with write(2) checked to the last byte. A statement that fails
   half-way leaves nothing, and a terminating signal that arrives during a
   write takes effect after it (cancel.h), so the output is complete lines.
   A failed write (a full disk, a closed pipe) is kept and reported; the run
   then stops. */
#ifndef PSIKAPPA_SINK_H
#define PSIKAPPA_SINK_H

#include <stddef.h>
#include <stdio.h>

typedef struct sink {
    int fd;          /* where records go (1: standard output) */
    FILE *rec;       /* the record being formatted, an open_memstream; owned */
    char *buf;       /* its memory (owned by the stream until sink_clear) */
    size_t len;
    int err;         /* errno of the first failed write, 0 while none */
} sink;

/* Prepares a sink writing to fd. Returns 0 when no memory stream could be
   made (the sink then discards everything and reports ENOMEM). */
int sink_init(sink *k, int fd);
/* Frees the record memory (pending text is dropped); fd stays open. */
void sink_clear(sink *k);

/* The stream records are formatted into (NULL when sink_init failed). */
FILE *sink_stream(sink *k);

/* Writes the pending record whole. Returns 1, or 0 when this or an earlier
   write failed (k->err says why). */
int sink_commit(sink *k);

/* Drops the pending record (its statement failed). */
void sink_discard(sink *k);

/* Writes what is pending, then flushes the C library's stdout (used by the
   interactive session) and closes fd, checking each step. Returns 1, or 0
   with k->err set. */
int sink_finish(sink *k);

#endif
