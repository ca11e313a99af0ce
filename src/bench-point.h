/* bench-point.h - the optional "points" section of the bench file:
 *
 *   "points": [ { "name": "alignment",
 *                 "changes": [ "source.power=20 mW", "+filter:ND9@M1", "ND9.od=2" ] } ]
 *
 * Each change is one text in the grammar of core-point.h.  Files without
 * the section hold no points.  The store keeps it in the bench's head
 * record, so every setup carries its points. */
#ifndef BENCH_POINT_H
#define BENCH_POINT_H

#include <jansson.h>

#include "core-model.h"

/* Reads the section into b->points (replacing them); checks its shape and
 * each change's grammar (model_validate applies them later). */
int     bench_points_from_json(json_t *v, struct bench *b, char **cause);
/* The section, or NULL when the bench has no points (caller decrefs). */
json_t *bench_points_to_json(const struct bench *b);

#endif
