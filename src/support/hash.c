#include "hash.h"

#define HASH_OFFSET 1469598103934665603ULL
#define HASH_PRIME 1099511628211ULL

/* The 64-bit finaliser of MurmurHash3: FNV alone leaves the low bits weak for keys that differ
   only in their high words. */
static ulong hash_finish(unsigned long long h)
{
    h ^= h >> 33;
    h *= 0xff51afd7ed558ccdULL;
    h ^= h >> 33;
    return (ulong) h;
}

ulong hash_slongs(const slong *key, slong n)
{
    unsigned long long h = HASH_OFFSET ^ (unsigned long long) n;
    for (slong i = 0; i < n; i++)
        h = (h ^ (unsigned long long) key[i]) * HASH_PRIME;
    return hash_finish(h);
}

ulong hash_bytes(const unsigned char *key, size_t n)
{
    unsigned long long h = HASH_OFFSET ^ (unsigned long long) n;
    for (size_t i = 0; i < n; i++)
        h = (h ^ key[i]) * HASH_PRIME;
    return hash_finish(h);
}
