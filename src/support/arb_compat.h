/* Arb ships inside FLINT 3 (<flint/arb.h>) and as a separate library with
   FLINT 2.9 (<arb.h>, Debian's libflint-arb); CMake tells which. */
#ifndef PSIKAPPA_ARB_COMPAT_H
#define PSIKAPPA_ARB_COMPAT_H

#ifdef PSIKAPPA_FLINT3_ARB
#include <flint/arb.h>
#else
#include <arb.h>
#endif

#endif
