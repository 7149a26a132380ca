/* Interrupts (Ctrl-C) and the --time-limit timer. Signal handlers only set a
   flag; long loops of the evaluator and the engine poll it and stop with a
   clear message, so the output printed so far stays complete lines. */
#ifndef PSIKAPPA_CANCEL_H
#define PSIKAPPA_CANCEL_H

#include <stdatomic.h>
#include <signal.h>

enum { CANCEL_NONE = 0, CANCEL_INTERRUPT = 1, CANCEL_TIMEOUT = 2 };

/* Nonzero (one of the CANCEL_ codes) once a stop was requested. The one cancellation
   convention: signal handlers store into it, and every loop of the evaluator and of the
   engines, worker threads included, polls it (or the pointer to it an engine was given).
   A lock-free atomic_int is both what C11 lets a signal handler write and what threads may
   read without a data race. */
extern atomic_int cancel_flag;

/* Installs the handlers: SIGINT stops the computation (the statement fails
   with a message); SIGTERM and SIGHUP end the program at once with status
   128 + the signal's number, except during a write of output, which is
   finished first (sink.h), so that no half line is left; SIGXFSZ is ignored
   so that a file-size limit makes writes fail (and be reported) instead of
   killing the program. Also a timer of `seconds` (0: none). */
void cancel_install(double seconds);

/* Set by sink.c while a record is being written: a terminating signal then
   only records itself, and cancel_after_write acts on it. */
extern volatile sig_atomic_t cancel_writing;

/* From a signal handler: writes msg to stderr and ends the program with
   status 128 + sig, or, while a record is being written, once it is out. */
void cancel_end_program(int sig, const char *msg);

/* Ends the program now if a terminating signal arrived during a write. */
void cancel_after_write(void);

/* Clears a pending request (the interactive session does this after each input). */
void cancel_reset(void);

/* The exit status for the current request: 130 for an interrupt, 124 for a timeout. */
int cancel_exit_status(void);

/* The message for the current request. */
const char *cancel_message(void);

#endif
