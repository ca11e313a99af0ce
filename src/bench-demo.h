/* bench-demo.h - the demo bench, built into the program so that it works
 * from any directory.  An invented scenario: table 3 of our own laser lab. */
#ifndef BENCH_DEMO_H
#define BENCH_DEMO_H

extern const char bench_demo_text[];      /* a bench file, NUL-terminated */

#endif
