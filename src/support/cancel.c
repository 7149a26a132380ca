#include "cancel.h"

#include <assert.h>
#include <stdatomic.h>
#include <string.h>
#include <sys/time.h>
#include <unistd.h>

static_assert(ATOMIC_INT_LOCK_FREE == 2, "cancel_flag is written by signal handlers: it must be lock-free");

atomic_int cancel_flag;
volatile sig_atomic_t cancel_writing;
static volatile sig_atomic_t cancel_pending_signal;
static const char *volatile cancel_pending_message;

/* Leaves at once (async-signal-safe): nothing half-written can be pending,
   since output is only ever written as whole records. */
static void cancel_terminate(int sig, const char *msg)
{
    ssize_t w = write(STDERR_FILENO, msg, strlen(msg));
    (void)w;
    _exit(128 + sig);
}

void cancel_end_program(int sig, const char *msg)
{
    if (cancel_writing) {
        cancel_pending_message = msg;
        cancel_pending_signal = sig;
    } else {
        cancel_terminate(sig, msg);
    }
}

static void cancel_on_signal(int sig)
{
    cancel_flag = sig == SIGALRM ? CANCEL_TIMEOUT : CANCEL_INTERRUPT;
}

static void cancel_on_terminate(int sig)
{
    cancel_end_program(sig, "psikappa: terminated by a signal; the computation was stopped\n");
}

void cancel_after_write(void)
{
    if (cancel_pending_signal)
        cancel_terminate(cancel_pending_signal, cancel_pending_message);
}

void cancel_install(double seconds)
{
    struct sigaction sa;
    memset(&sa, 0, sizeof sa);
    sa.sa_handler = cancel_on_signal;
    sigemptyset(&sa.sa_mask);
    sigaction(SIGINT, &sa, NULL);
    sa.sa_handler = cancel_on_terminate;
    sigaction(SIGTERM, &sa, NULL);
    sigaction(SIGHUP, &sa, NULL);
    signal(SIGXFSZ, SIG_IGN);
    sa.sa_handler = cancel_on_signal;
    /* beyond about three years (setitimer's range varies) there is no limit */
    if (!(seconds > 0) || seconds > 1e8)
        return;
    sigaction(SIGALRM, &sa, NULL);
    struct itimerval t;
    memset(&t, 0, sizeof t);
    t.it_value.tv_sec = (time_t)seconds;
    t.it_value.tv_usec = (suseconds_t)((seconds - (double)(time_t)seconds) * 1e6);
    setitimer(ITIMER_REAL, &t, NULL);
}

void cancel_reset(void)
{
    cancel_flag = CANCEL_NONE;
}

int cancel_exit_status(void)
{
    return cancel_flag == CANCEL_TIMEOUT ? 124 : cancel_flag == CANCEL_INTERRUPT ? 130 : 1;
}

const char *cancel_message(void)
{
    return cancel_flag == CANCEL_TIMEOUT ? "time limit reached; the computation was stopped"
                                         : "interrupted; the computation was stopped";
}
