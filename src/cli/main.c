/* psikappa: command line, exit codes. */
#include <errno.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>

#include "cancel.h"
#include "deadline.h"
#include "interp.h"
#include "memory.h"
#include "options.h"
#include "repl.h"
#include "source.h"
#include "util.h"
#include "verify_account.h"
#include "volume_table_store.h"

#define PSIKAPPA_VERSION "0.1.0"

enum { EXIT_SCRIPT_ERROR = 1, EXIT_USAGE = 2 };

static void main_usage(FILE *out)
{
    fputs("usage: psikappa [options] [script.pk ...]\n"
          "       psikappa [options] -e CODE [-e CODE ...]\n"
          "\n"
          "Exact intersection numbers of psi and kappa classes on Mbar_{g,n}, Weil-Petersson\n"
          "volumes and specialisations of the Witten-Kontsevich free energy.\n"
          "With no script and no -e, the program is read from standard input; on a terminal\n"
          "that is an interactive session (type help there).\n"
          "\n"
          "options:\n"
          "  -e CODE            run CODE (may be repeated; everything runs in order, sharing definitions)\n"
          "  --explain          print the reduction of every integral statement (to psi-only\n"
          "                     correlators; Hodge classes by Newton's identities and Mumford's formula)\n"
          "  --no-store         do not keep or reuse answers in the results store\n"
          "  --store FILE       keep the results store in FILE (default ~/.cache/psikappa/results.sqlite)\n"
          "  --verify           check every result by a second, independent route and report a\n"
          "                     disagreement as an error: correlators and psi-only integrals by the\n"
          "                     DVV recursion (or a closed form) and the KdV recursion, kappa integrals\n"
          "                     by the pushforward formula and the Kaufmann-Manin-Zagier time shift,\n"
          "                     volumes by the volume engine and the pushforward reduction, Hodge\n"
          "                     integrals by the Faber-Pandharipande operator (or a closed form) and\n"
          "                     Mumford's formula (a second route beyond --max-terms/--max-table/\n"
          "                     --max-seconds is skipped; answers are not stored); at the end, on\n"
          "                     stderr, how many values and monomials were checked and why the others\n"
          "                     were not\n"
          "  --verify=strict    the same, and a value that could not be checked is an error\n"
          "  --volume-engine    send every recognised volume integral (exp(c*kappa_1), kappa_1^D, psi\n"
          "                     monomials times them, volume polynomials) to the polynomial-time engine,\n"
          "                     also the small ones that otherwise use the reduction (with --verify: a\n"
          "                     comparison of the two routes)\n"
          "  --import-volumes FILE\n"
          "                     keep the table of V_{g,n} in FILE (as psikappa-volumes-mpi prints it) in\n"
          "                     the results store, after checking every value modulo one more prime\n"
          "  --format NAME      print values as exact (default), decimal, latex, csv or json\n"
          "  --digits N         correct significant digits of decimal output (1 to 1000000, default 20)\n"
          "  --precision D      working precision of reals in decimal digits, as the statement\n"
          "                     precision D at the start (1 to 100000, default 30)\n"
          "  --lib DIR          add DIR to the folders searched by load \"file.pk\"\n"
          "  --max-terms N      refuse integrals reducing to more than N correlator terms (default 2e7)\n"
          "  --max-table N      refuse computations needing more than N memo entries, and lists of\n"
          "                     more than N values (default 3e7)\n"
          "  --max-depth N      limit nesting of user-function calls (1 to 1000000, default 2000)\n"
          "  --max-memory GIB   cap the memory of numbers at GIB gibibytes (the process may use\n"
          "                     a little more)\n"
          "  --max-seconds S    refuse requests predicted to run longer than S seconds (default 600)\n"
          "  --time-limit S     stop after S seconds, 0.001 to 1e8 (exit status 124)\n"
          "  -h, --help         show this help\n"
          "  --version          show the version\n"
          "\n"
          "exit status: 0 success, 1 error in a script, 2 bad command line,\n"
          "             124 time limit reached, 130 interrupted\n",
          out);
}

typedef struct {
    double time_limit;
    int ran;       /* a script, -e, --help or --version was given */
} main_state;

/* Applies --format, --store or --lib; returns 0 after refusing a bad value. */
static int main_text_option(interp *I, const char *opt, const char *arg)
{
    if (strcmp(opt, "--format") == 0) {
        if (arg && out_format_parse(&I->style.fmt, arg))
            return 1;
        options_refuse(stderr, opt, "one of exact, decimal, latex, csv, json", arg);
        return 0;
    }
    if (!arg || !*arg || arg[0] == '-') {   /* "--lib -e CODE": the folder is missing */
        options_refuse(stderr, opt, strcmp(opt, "--lib") == 0 ? "a folder" : "a file name", arg);
        return 0;
    }
    if (strcmp(opt, "--import-volumes") == 0)
        return 1;   /* run in order with the scripts (main_run) */
    if (strcmp(opt, "--store") == 0) {
        free(I->store_path);
        I->store_path = xstrdup(arg);
        I->store_always = getenv("PSIKAPPA_STORE_ALL") != NULL;
    } else {
        interp_add_search_dir(I, arg);
    }
    return 1;
}

/* Applies an option taking a value; returns 0 after refusing a bad value
   (out of range values are refused with the range, never capped). */
static int main_valued_option(interp *I, main_state *M, const char *opt, const char *arg)
{
    const option_range *r = options_find_range(opt);
    double v;
    if (!r)
        return main_text_option(I, opt, arg);
    if (!options_parse_number(r, arg, &v, stderr))
        return 0;
    if (strcmp(opt, "--max-terms") == 0) {
        I->lim.max_terms = v;
        I->lim.max_class_terms = (slong)v;
    } else if (strcmp(opt, "--max-table") == 0) {
        I->lim.max_table = v;
        wk_table_set_limit(I->wk, (slong)v);
    } else if (strcmp(opt, "--max-depth") == 0) {
        I->lim.max_depth = (int)v;
    } else if (strcmp(opt, "--max-seconds") == 0) {
        I->lim.max_seconds = v;
    } else if (strcmp(opt, "--digits") == 0) {
        I->style.digits = (slong)v;
    } else if (strcmp(opt, "--precision") == 0) {
        I->real_digits = (slong)v;
    } else if (strcmp(opt, "--max-memory") == 0) {
        if (!memory_set_limit(v * 1073741824.0))
            fputs("psikappa: warning: could not set the memory cap\n", stderr);
    } else {
        M->time_limit = v;
    }
    return 1;
}

static int main_is_valued(const char *a)
{
    static const char *opts[] = {"--max-terms", "--max-table", "--max-depth", "--max-memory", "--time-limit",
                                 "--lib", "--format", "--digits", "--precision", "--max-seconds",
                                 "--store", "--import-volumes"};
    for (size_t i = 0; i < sizeof opts / sizeof opts[0]; i++)
        if (strcmp(a, opts[i]) == 0)
            return 1;
    return 0;
}

static int main_run_file(interp *I, const char *path)
{
    char *why;
    source *src = source_read_script(path, 0, &why);
    if (!src) {
        fprintf(stderr, "psikappa: cannot run %s: %s\n", path, why);
        free(why);
        return EXIT_SCRIPT_ERROR;
    }
    return interp_run_source(I, src);
}

static int main_run_code(interp *I, const char *code, int count)
{
    char name[32];
    snprintf(name, sizeof name, count > 1 ? "<-e#%d>" : "<-e>", count);
    return interp_run_source(I, source_new(name, code, strlen(code)));
}

/* Options first pass: everything but the scripts, so that limits apply to all of them. */
static int main_options(interp *I, main_state *M, int argc, char **argv)
{
    for (int i = 1; i < argc; i++) {
        const char *a = argv[i];
        if (strcmp(a, "-h") == 0 || strcmp(a, "--help") == 0) {
            main_usage(I->out);
            M->ran = 1;
        } else if (strcmp(a, "--version") == 0) {
            fprintf(I->out, "psikappa %s\n", PSIKAPPA_VERSION);
            M->ran = 1;
        } else if (strcmp(a, "--explain") == 0) {
            I->explain_all = 1;
        } else if (strcmp(a, "--verify") == 0) {
            I->verify = 1;
        } else if (strcmp(a, "--verify=strict") == 0) {
            I->verify = 2;
        } else if (strcmp(a, "--volume-engine") == 0) {
            I->route_volumes = 1;
        } else if (strcmp(a, "--no-store") == 0) {
            I->store_off = 1;
        } else if (main_is_valued(a)) {
            if (!main_valued_option(I, M, a, i + 1 < argc ? argv[i + 1] : NULL))
                return EXIT_USAGE;
            i++;
        } else if (strcmp(a, "-e") == 0) {
            if (++i >= argc) {
                options_refuse(stderr, "-e", "code to run", NULL);
                return EXIT_USAGE;
            }
        } else if (a[0] == '-' && a[1] != '\0') {
            fprintf(stderr, "psikappa: unknown option %s (see psikappa --help)\n", a);
            return EXIT_USAGE;
        }
    }
    return 0;
}

/* Second pass: runs -e code and scripts in the order given. */
static int main_run(interp *I, main_state *M, int argc, char **argv)
{
    int status = 0, ecount = 0;
    for (int i = 1; i < argc && status == 0; i++) {
        const char *a = argv[i];
        if (strcmp(a, "--import-volumes") == 0) {
            status = voltab_import_file(I, argv[++i]);
            M->ran = 1;
        } else if (main_is_valued(a)) {
            i++;
        } else if (strcmp(a, "-e") == 0) {
            status = main_run_code(I, argv[++i], ++ecount);
            M->ran = 1;
        } else if (a[0] != '-' || a[1] == '\0') {
            status = main_run_file(I, a);
            M->ran = 1;
        }
    }
    if (status == 0 && !M->ran)
        status = isatty(STDIN_FILENO) && isatty(STDOUT_FILENO) ? repl_run(I) : main_run_file(I, "-");
    return status;
}

int main(int argc, char **argv)
{
    char stack_base;
    util_stack_init(&stack_base);
    memory_install_hooks();
    interp I;
    interp_init(&I);
    interp_install_abort_handler();
    main_state M = {0, 0};
    const char *env_store = getenv("PSIKAPPA_STORE");
    I.store_off = env_store && strcmp(env_store, "off") == 0;
    int status = main_options(&I, &M, argc, argv);
    if (status == 0) {
        cancel_install(M.time_limit);
        deadline_start(M.time_limit);
        status = main_run(&I, &M, argc, argv);
        if (status != 0 && cancel_flag)
            status = cancel_exit_status();
    }
    if (!sink_finish(&I.sink)) {
        if (I.sink.err && status == 0)
            fprintf(stderr, "psikappa: error: cannot write the output: %s\n", strerror(I.sink.err));
        if (status == 0)
            status = EXIT_SCRIPT_ERROR;
    }
    verify_print(&I, stderr);
    interp_clear(&I);
    flint_cleanup();
    return status;
}
