#include "repl.h"

#include <errno.h>
#include <locale.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/select.h>
#include <sys/stat.h>
#include <termios.h>
#include <unistd.h>
#include <wchar.h>

#include <histedit.h>

#include "cancel.h"
#include "diag.h"
#include "parse.h"
#include "strbuf.h"
#include "util.h"

#define REPL_PROMPT "pk> "
#define REPL_PROMPT_MORE "..> "
#define REPL_HISTORY_SIZE 1000

volatile sig_atomic_t interp_interrupted = 0;

/* 1 while a chunk runs: a second Ctrl-C then means "stop now". */
static volatile sig_atomic_t repl_busy = 0;

typedef struct repl_session {
    interp *I;
    EditLine *el;
    History *hist;
    const char *prompt;        /* current prompt text (static storage) */
    char history_path[1024];   /* "" when there is no place for history */
    strbuf pending;            /* lines of an unfinished chunk */
    long open;                 /* brackets ( [ { of pending still open */
    struct termios old_tty;    /* terminal modes before the session */
    int have_tty;              /* old_tty is valid and must be restored */
    int history_dirty;         /* lines added since the history file was written */
    struct sigaction old_int;  /* restored when the session ends */
    sigset_t old_mask;         /* signal mask before the session */
    char *old_ctype;           /* LC_CTYPE before the session, owned */
} repl_session;

/* SIGINT: at the prompt it interrupts the read (no SA_RESTART) so the line
   is dropped; during a computation it raises cancel_flag, which the
   evaluator polls, and a second press ends the program in case the running
   code does not poll (a long FLINT call). */
static void repl_on_sigint(int sig)
{
    (void)sig;
    if (repl_busy && cancel_flag == CANCEL_INTERRUPT) {
        cancel_end_program(SIGINT, "\npsikappa: interrupted again; leaving\n");   /* status 130 */
        return;
    }
    if (repl_busy)
        cancel_flag = CANCEL_INTERRUPT;
    interp_interrupted = 1;
}

/* The XDG state location, else ~/.local/state (see repl.h).
   Returns buf, or NULL when there is no home or buf is too small. */
const char *repl_history_path(char *buf, size_t len)
{
    const char *xdg = getenv("XDG_STATE_HOME"), *home = getenv("HOME");
    int n;
    if (xdg && xdg[0] == '/')
        n = snprintf(buf, len, "%s/psikappa/history", xdg);
    else if (home && home[0])
        n = snprintf(buf, len, "%s/.local/state/psikappa/history", home);
    else
        return NULL;
    return n > 0 && (size_t)n < len ? buf : NULL;
}

/* Creates the missing parent folders of path, private to the user.
   Returns 1 when they exist afterwards. */
static int repl_make_parents(const char *path)
{
    char *p = xstrdup(path);
    int ok = 1;
    for (char *s = p + 1; *s && ok; s++) {
        if (*s != '/')
            continue;
        *s = '\0';
        ok = mkdir(p, 0700) == 0 || errno == EEXIST;
        *s = '/';
    }
    free(p);
    return ok;
}

/* The "help" command: every form with a working example.
   Examples use names a session would define (k, g, i, j) where needed. */
void repl_print_help(FILE *out)
{
    fputs("Forms of the language, one example each:\n"
          "  correlator          <tau_2 tau_3>_2          <tau_{k} tau_0^3>_{g}\n"
          "  integral            int_{2,0} kappa_1^3      int_{2,0} (kappa_1^3 + kappa_1*kappa_2)\n"
          "  classes             psi_1  kappa_2  psi_{i}  kappa_{j}   (products, sums, powers)\n"
          "  exponential         int_{1,1} exp(2*pi^2*kappa_1)\n"
          "  show the reduction  explain int_{2,0} kappa_1^3\n"
          "  volume polynomial   V_{1,1}                  dim(2, 0)\n"
          "  binding             let x = 3/4              x := x + 1   (update)\n"
          "  function            let f(a, b) = a^2 + b\n"
          "  loop                for i in 1..3 { print i, <tau_{3*i - 2}>_{i} }\n"
          "  print               print \"genus 1:\", <tau_1>_1\n"
          "  formal variables    var x, y      var L_{1..3}   (then L_1, L_{i})\n"
          "  sum, product        sum_{i=1..4} 1/i      prod_{i=1..3} (2*i - 1)\n"
          "  list                seq_{n=1..5} n^2      xs[2]\n"
          "  condition           if x > 1/2 then 1 else 0\n"
          "  comparison          <tau_1>_1 == 1/24\n"
          "  numbers             3/4   5!   7!!   2^10   pi\n"
          "  decimal digits      decimal(pi^2/6, 30)\n"
          "  builtins            binomial(7, 3)   numer(6/4)   denom(6/4)\n"
          "  table               table_{g=1..2, n=1..2} int_{g,n} kappa_1^(3*g - 3 + n)\n"
          "  output format       output decimal 10     (exact, decimal, latex, csv, json)\n"
          "  library             load \"volumes.pk\"\n"
          "A line that ends inside ( [ or { continues under \"" REPL_PROMPT_MORE "\".\n"
          "Ctrl-C clears the line (or stops a computation), Ctrl-D leaves.\n",
          out);
}

/* Blocks or unblocks SIGINT. Outside a computation SIGINT stays blocked
   and is only let in while waiting for a key (see repl_getc), so a Ctrl-C
   can never fall between "check the flag" and "wait for input". */
static void repl_mask_sigint(int how)
{
    sigset_t set;
    sigemptyset(&set);
    sigaddset(&set, SIGINT);
    sigprocmask(how, &set, NULL);
}

/* Waits for input with SIGINT let in atomically (pselect).
   Returns 1 when fd is readable, -1 with errno set otherwise. */
static int repl_wait_key(int fd)
{
    sigset_t open;
    sigprocmask(SIG_SETMASK, NULL, &open);
    sigdelset(&open, SIGINT);
    fd_set rd;
    FD_ZERO(&rd);
    FD_SET(fd, &rd);
    return pselect(fd + 1, &rd, NULL, NULL, NULL, &open) > 0 ? 1 : -1;
}

/* libedit's character reader, replaced so that Ctrl-C ends the read.
   Returns 1 with *wc set, 0 at end of input, -1 (errno EINTR) after Ctrl-C. */
static int repl_getc(EditLine *el, wchar_t *wc)
{
    (void)el;
    mbstate_t st;
    memset(&st, 0, sizeof st);
    for (;;) {
        if (interp_interrupted) {
            errno = EINTR;
            return -1;
        }
        if (cancel_flag == CANCEL_TIMEOUT)
            return 0; /* --time-limit covers the whole session: end it like Ctrl-D */
        if (repl_wait_key(STDIN_FILENO) < 0) {
            if (errno == EINTR)
                continue;
            return -1;
        }
        char c;
        ssize_t k = read(STDIN_FILENO, &c, 1);
        if (k == 0)
            return 0;
        if (k < 0) {
            if (errno == EINTR || errno == EAGAIN)
                continue;
            return -1;
        }
        size_t r = mbrtowc(wc, &c, 1, &st);
        if (r == (size_t)-2)
            continue; /* the middle of a multibyte character */
        if (r == (size_t)-1)
            *wc = (wchar_t)(unsigned char)c; /* not in the locale's set: pass the byte */
        return 1;
    }
}

/* libedit asks for the prompt through a callback; the session rides along
   as client data so no global is needed. */
static char *repl_prompt(EditLine *el)
{
    repl_session *rs = NULL;
    el_get(el, EL_CLIENTDATA, &rs);
    return (char *)(rs ? rs->prompt : REPL_PROMPT);
}

/* Largest history file that is read: 1000 lines of ordinary input fit many
   times over; anything larger is not a history this program wrote. */
#define REPL_HISTORY_MAX_BYTES (4u << 20)

/* 1 when path is missing (created on the first save) or a regular file of at
   most REPL_HISTORY_MAX_BYTES; otherwise warns and clears path, so that the
   session neither reads (a device could be endless) nor writes it. */
static int repl_history_usable(char *path)
{
    struct stat st;
    const char *why = NULL;
    if (stat(path, &st) != 0)
        return 0;   /* missing: nothing to load, saved later */
    if (!S_ISREG(st.st_mode))
        why = "it is not a regular file";
    else if ((unsigned long long)st.st_size > REPL_HISTORY_MAX_BYTES)
        why = "it is larger than 4 MiB";
    if (!why)
        return 1;
    fprintf(stderr, "psikappa: warning: not using the history file %s: %s\n", path, why);
    path[0] = '\0';
    return 0;
}

/* Loads the history file if there is one (a missing file is normal). */
static void repl_history_open(repl_session *rs)
{
    HistEvent ev;
    rs->hist = history_init();
    history(rs->hist, &ev, H_SETSIZE, REPL_HISTORY_SIZE);
    history(rs->hist, &ev, H_SETUNIQUE, 1);
    if (!repl_history_path(rs->history_path, sizeof rs->history_path))
        rs->history_path[0] = '\0';
    if (rs->history_path[0] && repl_history_usable(rs->history_path))
        history(rs->hist, &ev, H_LOAD, rs->history_path);
}

/* Keeps type-ahead when Ctrl-C stops a computation (on = 1, before it runs):
   by default the terminal driver discards its input queue on an interrupt,
   which would drop the lines typed while the computation ran. The flag is
   set around each computation only, since line editing resets the modes
   when it reads a line; on = 0 puts the flag back as it was. */
static void repl_keep_typeahead(repl_session *rs, int on)
{
    struct termios t;
    if (!rs->have_tty || tcgetattr(STDIN_FILENO, &t) != 0)
        return;
    if (on)
        t.c_lflag |= NOFLSH;
    else
        t.c_lflag = (t.c_lflag & ~(tcflag_t)NOFLSH) | (rs->old_tty.c_lflag & NOFLSH);
    tcsetattr(STDIN_FILENO, TCSANOW, &t);
}

/* Sets up line editing, history and signals. The session owns el and hist;
   repl_session_clear undoes everything. */
static void repl_session_init(repl_session *rs, interp *I)
{
    memset(rs, 0, sizeof *rs);
    rs->I = I;
    rs->prompt = REPL_PROMPT;
    strbuf_init(&rs->pending);
    /* multibyte editing needs the user's character set; numbers are unaffected */
    const char *ct = setlocale(LC_CTYPE, NULL);
    rs->old_ctype = xstrdup(ct ? ct : "C");
    setlocale(LC_CTYPE, "");
    rs->have_tty = tcgetattr(STDIN_FILENO, &rs->old_tty) == 0;
    repl_history_open(rs);
    rs->el = el_init("psikappa", stdin, stdout, stderr);
    el_set(rs->el, EL_CLIENTDATA, rs);
    el_set(rs->el, EL_PROMPT, repl_prompt);
    el_set(rs->el, EL_EDITOR, "emacs");
    el_set(rs->el, EL_HIST, history, rs->hist);
    el_set(rs->el, EL_GETCFN, repl_getc);
    el_source(rs->el, NULL); /* the user's ~/.editrc, if any */
    struct sigaction sa;
    memset(&sa, 0, sizeof sa);
    sa.sa_handler = repl_on_sigint;
    sigemptyset(&sa.sa_mask);
    sa.sa_flags = 0; /* no SA_RESTART: Ctrl-C must interrupt the terminal read */
    sigaction(SIGINT, &sa, &rs->old_int);
    sigprocmask(SIG_SETMASK, NULL, &rs->old_mask);
    repl_mask_sigint(SIG_BLOCK);
}

static void repl_history_save(repl_session *rs);

/* Restores the terminal, signals and locale; frees everything. */
static void repl_session_clear(repl_session *rs)
{
    repl_history_save(rs);
    sigprocmask(SIG_SETMASK, &rs->old_mask, NULL);
    sigaction(SIGINT, &rs->old_int, NULL);
    el_end(rs->el);
    if (rs->have_tty)
        tcsetattr(STDIN_FILENO, TCSANOW, &rs->old_tty);
    history_end(rs->hist);
    strbuf_clear(&rs->pending);
    setlocale(LC_CTYPE, rs->old_ctype);
    free(rs->old_ctype);
}

/* 1 when more typed or pasted input is already waiting to be read. */
static int repl_input_waiting(void)
{
    fd_set rd;
    struct timeval now = {0, 0};
    FD_ZERO(&rd);
    FD_SET(STDIN_FILENO, &rd);
    return select(STDIN_FILENO + 1, &rd, NULL, NULL, &now) > 0;
}

/* Writes the history file if lines were added since it was last written. */
static void repl_history_save(repl_session *rs)
{
    HistEvent ev;
    if (rs->history_dirty && rs->history_path[0] && repl_make_parents(rs->history_path))
        history(rs->hist, &ev, H_SAVE, rs->history_path);
    rs->history_dirty = 0;
}

/* Appends one line to the history and saves the file as soon as no more
   input is waiting, so that a crash or a double Ctrl-C loses nothing typed
   by hand, while a long paste does not rewrite the file once per line. */
static void repl_history_add(repl_session *rs, const char *line)
{
    HistEvent ev;
    history(rs->hist, &ev, H_ENTER, line);
    rs->history_dirty = 1;
    if (!repl_input_waiting())
        repl_history_save(rs);
}

/* Reads one line without its newline into *line (a new string).
   Returns 1 for a line, 0 at end of input, -1 after Ctrl-C. */
static int repl_read_line(repl_session *rs, char **line)
{
    int count = 0;
    interp_interrupted = 0;
    errno = 0;
    const char *s = el_gets(rs->el, &count);
    if (interp_interrupted || (!s && count < 0 && errno == EINTR)) {
        interp_interrupted = 0;
        return -1;
    }
    if (!s || count <= 0)
        return 0;
    size_t n = strlen(s);
    while (n > 0 && (s[n - 1] == '\n' || s[n - 1] == '\r'))
        n--;
    *line = xmalloc(n + 1);
    memcpy(*line, s, n);
    (*line)[n] = '\0';
    return 1;
}

/* True for a line that is only the word help or :help (spaces allowed). */
static int repl_is_help(const char *line)
{
    while (*line == ' ' || *line == '\t')
        line++;
    size_t n = strlen(line);
    while (n > 0 && (line[n - 1] == ' ' || line[n - 1] == '\t'))
        n--;
    return (n == 4 && strncmp(line, "help", 4) == 0) || (n == 5 && strncmp(line, ":help", 5) == 0);
}

/* True when the text has nothing but blanks. */
static int repl_is_blank(const char *s)
{
    return s[strspn(s, " \t\r\n")] == '\0';
}

/* Runs the pending chunk in the session's interpreter. Errors were already
   reported by the interpreter; the session simply goes on. */
static void repl_run_pending(repl_session *rs)
{
    repl_busy = 1;
    interp_interrupted = 0;
    if (cancel_flag == CANCEL_INTERRUPT)
        cancel_reset();
    if (!repl_input_waiting())
        repl_history_save(rs);
    repl_keep_typeahead(rs, 1);
    repl_mask_sigint(SIG_UNBLOCK);
    interp_run_source(rs->I, source_new("<input>", rs->pending.data, rs->pending.len));
    fflush(stdout);
    repl_keep_typeahead(rs, 0);
    repl_mask_sigint(SIG_BLOCK);
    repl_busy = 0;
    interp_interrupted = 0;
    /* an interrupt ends only the computation it stopped, not the session */
    if (cancel_flag == CANCEL_INTERRUPT)
        cancel_reset();
    strbuf_clear(&rs->pending);
    strbuf_init(&rs->pending);
    rs->open = 0;
}

/* Handles one line: help, a continuation, or a complete chunk to run. */
static void repl_take_line(repl_session *rs, const char *line)
{
    if (rs->pending.len == 0 && repl_is_help(line)) {
        repl_history_add(rs, line);
        repl_print_help(stdout);
        return;
    }
    if (rs->pending.len == 0 && repl_is_blank(line))
        return;
    repl_history_add(rs, line);
    strbuf_puts(&rs->pending, line);
    strbuf_putc(&rs->pending, '\n');
    /* one pass per line, so a pasted block costs linear time; the chunk is
       parsed once, when every bracket is closed */
    rs->open = source_open_brackets(line, strlen(line), rs->open);
    if (rs->open > 0) {
        rs->prompt = REPL_PROMPT_MORE;
        return;
    }
    rs->prompt = REPL_PROMPT;
    repl_run_pending(rs);
}

/* Ctrl-C at a prompt: drop the line and any unfinished chunk. */
static void repl_cancel(repl_session *rs)
{
    fputs("\n", stdout);
    fflush(stdout);
    strbuf_clear(&rs->pending);
    strbuf_init(&rs->pending);
    rs->open = 0;
    rs->prompt = REPL_PROMPT;
}

/* Reads, runs and reports until Ctrl-D (see repl.h).
   Returns 0, or the time-limit status when --time-limit ended it. */
int repl_run(interp *I)
{
    repl_session rs;
    repl_session_init(&rs, I);
    fputs("psikappa interactive session: type help for the forms of the language, Ctrl-D to leave.\n", stdout);
    fflush(stdout);
    for (;;) {
        char *line = NULL;
        int r = repl_read_line(&rs, &line);
        if (r == 0)
            break;
        if (r < 0)
            repl_cancel(&rs);
        else
            repl_take_line(&rs, line);
        free(line);
    }
    fputs("\n", stdout);
    fflush(stdout);
    repl_session_clear(&rs);
    if (cancel_flag == CANCEL_TIMEOUT) {
        fprintf(stderr, "psikappa: %s\n", cancel_message());
        return cancel_exit_status();
    }
    return 0;
}
