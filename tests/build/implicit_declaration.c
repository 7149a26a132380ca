/* Must NOT compile: the ctest build/implicit-declaration-rejected builds it and
 * expects failure. It calls a FLINT function without including the header
 * that declares it (flint/fmpq_vec.h; FLINT 3 dropped it from fmpq.h), which C would otherwise accept with an
 * implied int result, cutting the returned pointer to 32 bits. */
#include <flint/fmpz.h>

void *probe_missing_header(void)
{
    return (void *)(long)_fmpq_vec_init(4);
}
