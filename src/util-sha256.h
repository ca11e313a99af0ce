/* util-sha256.h - SHA-256 (FIPS 180-4) of a block of memory, as the hex
 * text a person compares with `sha256sum`.  The review prints it so that a
 * paper copy can be matched to the setup it was made from. */
#ifndef UTIL_SHA256_H
#define UTIL_SHA256_H

#include <stddef.h>

/* 64 lowercase hex digits and a NUL into hex[65]. */
void sha256_hex(const void *data, size_t len, char hex[65]);

#endif
