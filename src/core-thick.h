/* core-thick.h - what a transmissive element's glass does to the beam: its
 * index (given, or from the Sellmeier fit of its material), the crossing
 * of its thickness (plates, thick lenses, Brewster plates), and a lens
 * given by its radii.  Reduced ray matrices (slopes times the local index,
 * Kogelnik & Li 1966; Siegman, Lasers, ch. 15), REFERENCE §1 and §15.
 * Pure computation. */
#ifndef CORE_THICK_H
#define CORE_THICK_H

#include "core-beam.h"
#include "core-model.h"

/* n of a lens or window at the vacuum wavelength lambda: the Sellmeier fit
 * of its `material` when given (NAN outside the fit's range: model_validate
 * refuses that), else its `index` (or the default). */
double thick_index(const struct element *, double lambda);

/* Free-space lengths equivalent to a Brewster plate of thickness t and
 * index n (Kogelnik, Ippen, Dienes & Shank 1972): tangential (x, in the
 * plane of incidence) t√(n²+1)/n⁴, sagittal (y) t√(n²+1)/n². */
void   thick_brewster_lengths(double n, double t, double *tangential, double *sagittal);

/* Focal length of a lens from its radii (absent = flat: pass INFINITY),
 * thickness and index: 1/f = (n − 1)[1/r1 − 1/r2 + (n − 1)t/(n r1 r2)]
 * (thick-lens lensmaker's equation, Hecht sec. 6.2).  INFINITY when it
 * has no power. */
double thick_lens_focal(double n, double r1, double r2, double t);

/* The element after it has acted at its front surface: a lens of `focal`
 * (thin, on the axes it acts on) or of radii r1, r2 (the thick lens:
 * surface · [[1, t/n], [0, 1]] · surface), then, for a lens given by focal
 * and for a window, the crossing of its thickness ([[1, t/n], [0, 1]], or
 * the Brewster lengths).  Returns the geometric path in the glass (m, 0
 * without thickness): how far z advances. */
double thick_apply(const struct element *, double lambda,
           struct beam_axis *x, struct beam_axis *y);

/* The same element crossed the other way (a ghost going upstream): a
 * lens by its radii meets its back face first, a lens by its focal length
 * its plate first; a window is the same both ways. */
double thick_apply_back(const struct element *, double lambda,
           struct beam_axis *x, struct beam_axis *y);

#endif
