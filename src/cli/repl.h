/* The interactive session: psikappa started on a terminal with no script.
   Lines are edited with libedit (history kept between sessions); input that
   ends inside an open bracket or block continues on the next line under the
   "..> " prompt, and each complete chunk runs in the same interpreter, so
   definitions persist and an error only ends its own chunk. */
#ifndef PSIKAPPA_REPL_H
#define PSIKAPPA_REPL_H

#include <signal.h>
#include <stddef.h>

#include "interp.h"

/* Set to 1 by the session's SIGINT handler on every Ctrl-C; the session
   reads and clears it. During a computation the handler also raises
   cancel_flag (cancel.h), which the evaluator polls to stop; a second Ctrl-C
   while that request is still pending ends the program with status 130. */
extern volatile sig_atomic_t interp_interrupted;

/* Runs the session on standard input/output until Ctrl-D. Borrows I (the
   caller still clears it). Replaces the SIGINT handler for its duration and
   restores the previous one. Returns the exit status: 0, or 124 when the
   --time-limit timer (cancel.h) ended the session. */
int repl_run(interp *I);

/* Writes the history location into buf: $XDG_STATE_HOME/psikappa/history when
   XDG_STATE_HOME is absolute, else ~/.local/state/psikappa/history.
   Returns buf, or NULL when HOME is unknown or buf is too small. */
const char *repl_history_path(char *buf, size_t len);

/* Prints the list of language forms, one example each (the "help" command). */
void repl_print_help(FILE *out);

#endif
