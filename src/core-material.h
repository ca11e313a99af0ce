/* core-material.h - optical constants a bench needs when a part's data
 * sheet is silent: Fresnel reflectance of an uncoated surface and the
 * refractive index of fused silica.  Pure computation. */
#ifndef CORE_MATERIAL_H
#define CORE_MATERIAL_H

/* Power reflectances for s and p light going from index n1 into n2 at
 * aoi_deg; total internal reflection gives 1, 1. */
void   material_fresnel(double n1, double n2, double aoi_deg, double *rs, double *rp);
double material_brewster_deg(double n1, double n2);
/* Fused silica, Malitson (1965) Sellmeier; lambda in m, valid 0.21-3.71 µm
 * (NAN outside). */
double material_silica_index(double lambda);

/* The glasses of the `material` key (enum material_id of core-model.h):
 * n from the published Sellmeier fit n² = 1 + Σ Bᵢλ²/(λ² − Cᵢ) at the
 * vacuum wavelength lambda (m); NAN outside the fit's published range,
 * which *lo and *hi (m, each may be NULL) return. */
double material_index(int material, double lambda, double *lo, double *hi);
const char *material_source(int material);     /* the published fit, for messages */

#endif
