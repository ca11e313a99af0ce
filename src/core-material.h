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

#endif
