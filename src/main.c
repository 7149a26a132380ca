/* psikappa: command line, exit codes. */
#include <errno.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "interp.h"
#include "source.h"

#define PSIKAPPA_VERSION "0.1.0"

static void main_usage(FILE *out)
{
    fputs("usage: psikappa [options] [script.pk ...]\n"
          "       psikappa [options] -e CODE [-e CODE ...]\n"
          "\n"
          "Exact intersection numbers of psi and kappa classes on Mbar_{g,n}.\n"
          "With no script and no -e, the program is read from standard input.\n"
          "\n"
          "options:\n"
          "  -e CODE          run CODE (may be repeated; runs in order)\n"
          "  --explain        print the psi-only reduction of every integral statement\n"
          "  --max-terms N    refuse integrals reducing to more than N correlator terms\n"
          "  --max-table N    refuse computations needing more than N memo entries\n"
          "  --max-depth N    limit nesting of user-function calls\n"
          "  -h, --help       show this help\n"
          "  --version        show the version\n"
          "\n"
          "exit status: 0 success, 1 error in a script, 2 bad command line\n",
          out);
}

static int main_number_option(const char *opt, const char *arg, double *out)
{
    char *end;
    errno = 0;
    double v = arg ? strtod(arg, &end) : 0;
    if (!arg || errno || *end || v < 1) {
        fprintf(stderr, "psikappa: %s needs a positive number\n", opt);
        return 0;
    }
    *out = v;
    return 1;
}

/* Applies one option taking a value; returns 0 on a bad value. */
static int main_limit_option(interp *I, const char *opt, const char *arg)
{
    double v;
    if (!main_number_option(opt, arg, &v))
        return 0;
    if (strcmp(opt, "--max-terms") == 0) {
        I->lim.max_terms = v;
        I->lim.max_class_terms = v > 1e15 ? (slong)1e15 : (slong)v;
    } else if (strcmp(opt, "--max-table") == 0) {
        I->lim.max_table = v;
    } else {
        I->lim.max_depth = v > 1e6 ? 1000000 : (int)v;
    }
    return 1;
}

static int main_run_file(interp *I, const char *path)
{
    source *src = source_read_file(path);
    if (!src) {
        fprintf(stderr, "psikappa: cannot read %s: %s\n", path, strerror(errno));
        return 1;
    }
    return interp_run_source(I, src);
}

static int main_is_limit(const char *a)
{
    return strcmp(a, "--max-terms") == 0 || strcmp(a, "--max-table") == 0 || strcmp(a, "--max-depth") == 0;
}

int main(int argc, char **argv)
{
    interp I;
    interp_init(&I);
    interp_install_abort_handler();
    int status = 0, ran = 0, ecount = 0;
    for (int i = 1; i < argc && status == 0; i++) {
        const char *a = argv[i];
        if (strcmp(a, "-h") == 0 || strcmp(a, "--help") == 0) {
            main_usage(stdout);
            ran = 1;
        } else if (strcmp(a, "--version") == 0) {
            printf("psikappa %s\n", PSIKAPPA_VERSION);
            ran = 1;
        } else if (strcmp(a, "--explain") == 0) {
            I.explain_all = 1;
        } else if (main_is_limit(a)) {
            status = main_limit_option(&I, a, i + 1 < argc ? argv[i + 1] : NULL) ? 0 : 2;
            i++;
        } else if (strcmp(a, "-e") == 0) {
            if (i + 1 >= argc) {
                fputs("psikappa: -e needs code\n", stderr);
                status = 2;
                break;
            }
            const char *code = argv[++i];
            char name[32];
            ecount++;
            snprintf(name, sizeof name, ecount > 1 ? "<-e#%d>" : "<-e>", ecount);
            status = interp_run_source(&I, source_new(name, code, strlen(code)));
            ran = 1;
        } else if (a[0] == '-' && a[1] != '\0') {
            fprintf(stderr, "psikappa: unknown option %s (see psikappa --help)\n", a);
            status = 2;
        } else {
            status = main_run_file(&I, a);
            ran = 1;
        }
    }
    if (status == 0 && !ran)
        status = main_run_file(&I, "-");
    interp_clear(&I);
    flint_cleanup();
    return status;
}
